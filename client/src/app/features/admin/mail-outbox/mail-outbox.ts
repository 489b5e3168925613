import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatPaginator, PageEvent } from '@angular/material/paginator';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
} from '@angular/material/table';
import { mailKindLabel, type MailStateFilter, type OutboxMail, type OutboxPage } from '@spincycle/shared/mail/mail-outbox';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { MailOutboxApi } from '../mail-outbox-api';

export const DEFAULT_PAGE_SIZE = 25;
const EMPTY_PAGE: OutboxPage = { items: [], total: 0 };

/** The choices of the filter, in words. */
export const STATE_FILTER_OPTIONS: readonly { value: MailStateFilter; label: string }[] = [
  { value: 'unsent', label: 'Not sent yet' },
  { value: 'failed', label: 'Not sent, gave up' },
  { value: 'pending', label: 'Waiting to be sent' },
  { value: 'sending', label: 'Being sent now' },
  { value: 'sent', label: 'Sent' },
  { value: 'all', label: 'All mail' },
];

/** Where one mail stands, in words. */
export function mailStateText(mail: Pick<OutboxMail, 'state' | 'attempts'>): string {
  switch (mail.state) {
    case 'pending':
      return mail.attempts === 0 ? 'Waiting to be sent' : 'Waiting to be tried again';
    case 'sending':
      return 'Being sent now';
    case 'sent':
      return 'Sent';
    case 'failed':
      return 'Not sent, gave up';
  }
}

/**
 * The administrator's list of outgoing mail: when, to whom, the subject and kind, where it
 * stands and why the last try failed; "Send again" on mails that gave up. Message texts are
 * never shown (password-reset and invitation links are in them).
 */
@Component({
  selector: 'app-mail-outbox',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatFormField,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatLabel,
    MatOption,
    MatPaginator,
    MatRow,
    MatRowDef,
    MatSelect,
    MatTable,
    ReactiveFormsModule,
    UtcInstantPipe,
  ],
  templateUrl: './mail-outbox.html',
  styleUrl: './mail-outbox.scss',
})
export default class MailOutbox {
  private readonly api = inject(MailOutboxApi);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly columns = ['createdAt', 'to', 'subject', 'kind', 'state', 'attempts', 'lastError', 'actions'];
  protected readonly pageSizeOptions = [10, 25, 50, 100];
  protected readonly filterOptions = STATE_FILTER_OPTIONS;
  protected readonly kindLabel = mailKindLabel;
  protected readonly stateText = mailStateText;

  protected readonly stateControl = new FormControl<MailStateFilter>('unsent', { nonNullable: true });
  private readonly state = toSignal(this.stateControl.valueChanges, { initialValue: 'unsent' as MailStateFilter });

  /** Back to the first page whenever the filter changes. */
  protected readonly pageIndex = linkedSignal({ source: this.state, computation: () => 0 });
  protected readonly pageSize = signal(DEFAULT_PAGE_SIZE);

  protected readonly mails = this.api.listResource(() => ({
    state: this.state(),
    page: this.pageIndex() + 1,
    pageSize: this.pageSize(),
  }));

  /** The rows shown: the last page the server sent, patched with the answers to "Send again". */
  protected readonly page = linkedSignal<OutboxPage | undefined, OutboxPage>({
    source: () => (this.mails.hasValue() ? this.mails.value() : undefined),
    computation: (next, previous) => next ?? previous?.value ?? EMPTY_PAGE,
  });

  /** Ids of the mails being sent again; their buttons wait for the answer. */
  protected readonly pending = signal<ReadonlySet<number>>(new Set());
  /** Announced politely after each "Send again". */
  protected readonly announcement = signal('');

  protected readonly error = computed(() => loadErrorText(this.mails.error(), 'The outgoing mail could not be loaded.'));
  protected readonly empty = computed(() => this.mails.hasValue() && this.page().total === 0);
  protected readonly emptyText = computed(() => {
    switch (this.state()) {
      case 'unsent':
        return 'Every mail has been sent: none is waiting or has failed.';
      case 'failed':
        return 'No mail has failed.';
      case 'all':
        return 'No mail has been written yet.';
      default:
        return 'No mail is in this state.';
    }
  });

  protected readonly trackById = (_index: number, mail: OutboxMail) => mail.id;

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }

  protected recipients(mail: OutboxMail): string {
    return mail.to.length <= 3 ? mail.to.join(', ') : `${mail.to.slice(0, 3).join(', ')} and ${mail.to.length - 3} more`;
  }

  protected sendAgain(mail: OutboxMail): void {
    this.setPending(mail.id, true);
    this.api.resend(mail.id).subscribe({
      next: (updated) => {
        this.page.update((page) => ({ ...page, items: page.items.map((item) => (item.id === updated.id ? updated : item)) }));
        this.setPending(mail.id, false);
        this.announcement.set(
          updated.state === 'sent'
            ? `“${updated.subject}” was sent to ${this.recipients(updated)}.`
            : `“${updated.subject}” is not sent yet: ${updated.lastError ?? 'the mail server did not take it'} It will be tried again automatically.`,
        );
      },
      error: (error: unknown) => {
        this.setPending(mail.id, false);
        this.snackBar.open(`“${mail.subject}” was not sent again: ${readApiError(error).message}`, 'Dismiss', { duration: 10000 });
      },
    });
  }

  private setPending(id: number, on: boolean): void {
    this.pending.update((ids) => {
      const next = new Set(ids);
      if (on) next.add(id);
      else next.delete(id);
      return next;
    });
  }
}
