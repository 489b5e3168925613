import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardActions, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { RouterLink } from '@angular/router';
import { ROLE_LABELS, ROLES, type Role } from '@spincycle/shared/accounts/roles';
import { ROLE_GUIDE } from '../role-guide';

/** One card per role the person holds: what the role does here, and the pages for it. */
@Component({
  selector: 'app-your-roles',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatCard, MatCardActions, MatCardContent, MatCardHeader, MatCardTitle, RouterLink],
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
