import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { FormControl, FormGroup, FormGroupDirective, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
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
import { inviteMemberSchema, type ProposalMember } from '@spincycle/shared/proposals/proposal-schemas';
import { readApiError } from '../../../../core/http/api-error-message';
import { confirmAction } from '../../../../ui/confirm-dialog/confirm-dialog';
import { controlErrorMessage } from '../../../../ui/forms/server-errors';
import { zodValidator } from '../../../../ui/forms/zod-validator';
import { ProposalApi } from '../../proposal-api';
import { MEMBER_ROLE_LABELS } from '../../proposal-list/proposal-list';
import { ProposalStore } from '../../proposal-store';
import { DayPipe } from '../../../../ui/time/date-pipes';

/** The team tab: who is on the proposal; the PI invites co-investigators by e-mail and removes them. */
@Component({
  selector: 'app-proposal-team',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatError,
    MatFormField,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatHint,
    MatInput,
    MatLabel,
    MatProgressBar,
    MatRow,
    MatRowDef,
    MatTable,
    ReactiveFormsModule,
  ],
  templateUrl: './proposal-team.html',
  styles: `
    :host {
      display: block;
      max-inline-size: 960px;
    }
    .invite {
      display: flex;
      flex-wrap: wrap;
      align-items: flex-start;
      gap: 8px 16px;
      margin-block: 16px 0;
      mat-form-field {
        flex: 1 1 320px;
        max-inline-size: 480px;
      }
      button {
        margin-block-start: 8px;
      }
    }
    .who {
      display: flex;
      flex-direction: column;
      padding-block: 4px;
      .email {
        font: var(--mat-sys-body-small);
        color: var(--mat-sys-on-surface-variant);
      }
    }
    .invited {
      font-style: italic;
      color: var(--mat-sys-on-surface-variant);
    }
    .bar-slot {
      block-size: 4px;
    }
    .note {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export default class ProposalTeam {
  private readonly api = inject(ProposalApi);
  private readonly dialog = inject(MatDialog);
  protected readonly store = inject(ProposalStore);

  protected readonly columns = ['member', 'role', 'status', 'invited', 'actions'];
  /** Widened for the table's untyped row context. */
  protected readonly roleLabels: Readonly<Record<string, string>> = MEMBER_ROLE_LABELS;
  protected readonly errorOf = controlErrorMessage;
  protected readonly team = computed(() => this.store.proposal()?.team ?? []);
  protected readonly canManage = computed(() => this.store.isPi() && !this.store.readOnly());

  protected readonly email = new FormControl('', { nonNullable: true, validators: [zodValidator(inviteMemberSchema.shape.email)] });
  protected readonly inviteForm = new FormGroup({ email: this.email });
  /** Its directive: resetting through it also forgets the submission, so no error shows on the empty field. */
  private readonly inviteFormDirective = viewChild(FormGroupDirective);
  protected readonly busy = signal(false);
  protected readonly serverError = signal<string | null>(null);
  protected readonly announcement = signal('');

  protected invite(): void {
    if (this.busy()) return;
    const proposal = this.store.proposal();
    if (!proposal) return;
    if (this.email.invalid) {
      this.email.markAsTouched();
      return;
    }
    const input = inviteMemberSchema.parse({ email: this.email.value });
    this.busy.set(true);
    this.serverError.set(null);
    this.api.invite(proposal.id, input).subscribe({
      next: (member) => {
        this.busy.set(false);
        this.store.replace({ ...this.store.proposal()!, team: [...this.team(), member] });
        this.inviteFormDirective()?.resetForm();
        this.announcement.set(`Invitation sent to ${member.email}.`);
      },
      error: (error: unknown) => {
        this.busy.set(false);
        const body = readApiError(error);
        const errors = body.fieldErrors?.['email'];
        if (errors) {
          this.email.setErrors({ server: errors.join(' ') });
          this.email.markAsTouched();
        }
        this.serverError.set(body.message);
      },
    });
  }

  protected remove(member: ProposalMember): void {
    const proposal = this.store.proposal();
    if (!proposal) return;
    const who = member.displayName ?? member.email;
    confirmAction(this.dialog, {
      title: `Remove ${who}?`,
      message:
        member.status === 'invited'
          ? `The invitation sent to ${member.email} will no longer work.`
          : `${who} will no longer see or edit this proposal.`,
      confirmLabel: 'Remove',
      destructive: true,
    }).subscribe((confirmed) => {
      if (!confirmed) return;
      this.busy.set(true);
      this.api.removeMember(proposal.id, member.id).subscribe({
        next: () => {
          this.busy.set(false);
          this.store.replace({ ...this.store.proposal()!, team: this.team().filter((m) => m.id !== member.id) });
          this.announcement.set(`${who} removed from the team.`);
        },
        error: (error: unknown) => {
          this.busy.set(false);
          this.serverError.set(`${who} was not removed: ${readApiError(error).message}`);
        },
      });
    });
  }
}

