import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { SessionAuth } from '../../../core/auth/session-auth';
import { CycleOverview } from '../cycle-overview/cycle-overview';
import { YourProposals } from '../your-proposals/your-proposals';
import { YourRoles } from '../your-roles/your-roles';

/**
 * The signed-in home. Sections for everyone come first (the cycles, the person's roles);
 * each role-specific section (proposer, reviewer, facility manager, billing contact) is its own
 * small component in this folder, shown under `@if (auth.hasRole(...))` in the template.
 */
@Component({
  selector: 'app-home-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CycleOverview, YourProposals, YourRoles],
  template: `
    <div class="page">
      <h1>Home</h1>
      <p class="page-lead">Welcome, {{ name() }}. Here is where the allocation cycle stands.</p>
      @if (isProposer()) {
        <app-your-proposals />
      }
      <app-cycle-overview />
      <app-your-roles [roles]="roles()" />
    </div>
  `,
})
export default class HomePage {
  private readonly auth = inject(SessionAuth);
  protected readonly name = computed(() => this.auth.user()?.displayName ?? '');
  protected readonly roles = computed(() => this.auth.user()?.roles ?? []);
  protected readonly isProposer = computed(() => this.roles().includes('proposer'));
}
