import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { FormControl, FormGroup, FormGroupDirective, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
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
import { TeamReviewerCard } from '../../../review/team-reviewer/team-reviewer-card';
import { ProposalStore } from '../../proposal-store';
import { DayPipe } from '../../../../ui/time/date-pipes';
import { warningsOf, type TeamWarning } from '@spincycle/shared/proposals/team-warnings';

/** A caution about one team row, kept on screen until the row goes or the PI dismisses it. */
interface MemberCaution {
  memberId: number;
  email: string;
  warning: TeamWarning;
}

/**
 * The team tab: who is on the proposal; the PI invites co-investigators by e-mail and removes
 * them. An invitation the server answers with a caution (a reviewer of the cycle invited) shows
 * it above the table and beside the row; the invitation has gone out all the same.
 */
@Component({
  selector: 'app-proposal-team',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    TeamReviewerCard,
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
    MatIcon,
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
    .caution {
      display: flex;
      align-items: flex-start;
      gap: 12px;
      margin-block: 12px;
      padding: 12px 16px;
      border-radius: var(--mat-sys-corner-medium);
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
      mat-icon {
        flex: none;
      }
      p {
        margin: 0;
      }
      .caution-text {
        flex: 1;
        display: flex;
        flex-direction: column;
        gap: 4px;
      }
      button {
        flex: none;
      }
    }
    .row-flag {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      margin-inline-start: 8px;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface);
      mat-icon {
        font-size: 18px;
        inline-size: 18px;
        block-size: 18px;
        color: var(--mat-sys-tertiary);
      }
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
  /** Cautions from the server about rows of the team (e.g. a reviewer invited). */
  protected readonly cautions = signal<MemberCaution[]>([]);
  /** Ids of rows with a caution, for the flag in the table. */
  protected readonly cautioned = computed(() => new Set(this.cautions().map((c) => c.memberId)));

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
      next: (answer) => {
        this.busy.set(false);
        const warnings = warningsOf(answer);
        const { warnings: _w, ...member } = { ...answer, warnings };
        // A fresh link to a pending address answers the same row: replace it rather than add it twice.
        const team = this.team().some((m) => m.id === member.id)
          ? this.team().map((m) => (m.id === member.id ? member : m))
          : [...this.team(), member];
        this.store.replace({ ...this.store.proposal()!, team });
        this.cautions.update((list) => [
          ...list.filter((c) => c.memberId !== member.id),
          ...warnings.map((warning) => ({ memberId: member.id, email: member.email, warning })),
        ]);
        this.inviteFormDirective()?.resetForm();
        this.announcement.set([`Invitation sent to ${member.email}.`, ...warnings.map((w) => w.message)].join(' '));
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
          this.dismiss(member.id);
          this.announcement.set(`${who} removed from the team.`);
        },
        error: (error: unknown) => {
          this.busy.set(false);
          this.serverError.set(`${who} was not removed: ${readApiError(error).message}`);
        },
      });
    });
  }

  /** Hides the cautions about one row. */
  protected dismiss(memberId: number): void {
    this.cautions.update((list) => list.filter((c) => c.memberId !== memberId));
  }
}
