import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardActions, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { ROLE_LABELS, ROLES, type Role } from '@spincycle/shared/accounts/roles';
import { ROLE_GUIDE } from '../role-guide';

/**
 * One card per role the person holds: what the role does here, and the pages for it. A role
 * whose pages are still to come says so (what, and when in the cycle), with no link to them.
 */
@Component({
  selector: 'app-your-roles',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatCard, MatCardActions, MatCardContent, MatCardHeader, MatCardTitle, MatIcon, RouterLink],
  template: `
    <section aria-labelledby="roles-heading">
      <h2 id="roles-heading">Your roles</h2>
      @if (cards().length) {
        <div class="role-grid">
          @for (card of cards(); track card.role) {
            <mat-card appearance="outlined" [attr.data-role]="card.role">
              <mat-card-header>
                <mat-card-title>{{ card.label }}</mat-card-title>
              </mat-card-header>
              <mat-card-content>
                <p>{{ card.summary }}</p>
                @if (card.upcoming; as upcoming) {
                  <div class="upcoming" role="note" [attr.aria-labelledby]="'upcoming-' + card.role" data-testid="upcoming">
                    <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">schedule</mat-icon>
                    <div>
                      <p class="upcoming-title" [id]="'upcoming-' + card.role">Not in Spincycle yet</p>
                      <p>{{ upcoming.what }}</p>
                      <p><span class="when">When:</span> {{ upcoming.when }}</p>
                    </div>
                  </div>
                }
              </mat-card-content>
              <mat-card-actions>
                @for (link of card.links; track link.path) {
                  <a matButton [routerLink]="link.path">{{ link.label }}</a>
                }
              </mat-card-actions>
            </mat-card>
          }
        </div>
      } @else {
        <p class="no-roles">Your account holds no role yet. An administrator can give you one.</p>
      }
    </section>
  `,
  styles: `
    .role-grid {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(min(100%, 280px), 1fr));
      gap: 16px;
      margin-block-start: 12px;
    }
    mat-card {
      block-size: 100%;
    }
    p {
      margin: 8px 0 0;
      color: var(--mat-sys-on-surface-variant);
    }
    .upcoming {
      display: flex;
      gap: 8px;
      margin-block-start: 12px;
      padding: 8px 12px;
      border-radius: var(--mat-sys-corner-small);
      background: var(--mat-sys-surface-container);
      mat-icon {
        flex: none;
        margin-block-start: 8px;
        color: var(--mat-sys-on-surface-variant);
      }
      p {
        margin-block: 4px 0;
      }
      .upcoming-title,
      .when {
        font-weight: 600;
        color: var(--mat-sys-on-surface);
      }
    }
  `,
})
export class YourRoles {
  readonly roles = input.required<readonly Role[]>();

  protected readonly cards = computed(() =>
    ROLES.filter((role) => this.roles().includes(role)).map((role) => ({
      role,
      label: ROLE_LABELS[role],
      ...ROLE_GUIDE[role],
    })),
  );
}
