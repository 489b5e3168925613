import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, DestroyRef, DOCUMENT, inject, viewChild } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDivider } from '@angular/material/divider';
import { MatIcon } from '@angular/material/icon';
import { MatListItem, MatListItemIcon, MatListItemTitle, MatNavList } from '@angular/material/list';
import { MatMenu, MatMenuItem, MatMenuTrigger } from '@angular/material/menu';
import { MatSidenav, MatSidenavContainer, MatSidenavContent } from '@angular/material/sidenav';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatToolbar } from '@angular/material/toolbar';
import { MatTooltip } from '@angular/material/tooltip';
import { NavigationEnd, Router, RouterLink, RouterLinkActive } from '@angular/router';
import { ROLE_LABELS } from '@spincycle/shared/accounts/roles';
import { filter, map, skip } from 'rxjs';
import { SessionAuth } from '../auth/session-auth';
import { ColorScheme } from './color-scheme';
import { LogoMark } from './logo-mark';
import { visibleNavLinks } from './nav-links';

/** Width from which the navigation stays open beside the page instead of sliding over it. */
export const WIDE_LAYOUT_QUERY = '(min-width: 960px)';

/**
 * The frame around every page: top bar (product, scheme toggle, the person's menu), the
 * role-aware navigation and the <main> landmark the page is projected into.
 */
@Component({
  selector: 'app-shell',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LogoMark,
    MatButton,
    MatDivider,
    MatIcon,
    MatIconButton,
    MatListItem,
    MatListItemIcon,
    MatListItemTitle,
    MatMenu,
    MatMenuItem,
    MatMenuTrigger,
    MatNavList,
    MatSidenav,
    MatSidenavContainer,
    MatSidenavContent,
    MatToolbar,
    MatTooltip,
    RouterLink,
    RouterLinkActive,
  ],
  templateUrl: './app-shell.html',
  styleUrl: './app-shell.scss',
})
export class AppShell {
  private readonly auth = inject(SessionAuth);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly document = inject(DOCUMENT);
  protected readonly scheme = inject(ColorScheme);

  protected readonly user = this.auth.user;
  protected readonly links = computed(() => visibleNavLinks(this.user()));
  protected readonly roleLabels = computed(() => (this.user()?.roles ?? []).map((role) => ROLE_LABELS[role]));
  protected readonly wide = toSignal(
    inject(BreakpointObserver)
      .observe(WIDE_LAYOUT_QUERY)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  private readonly sidenav = viewChild(MatSidenav);

  constructor() {
    // After each in-app navigation, move focus to the page so that keyboard and screen-reader
    // users start at its content rather than on the link they followed.
    this.router.events
      .pipe(
        filter((event) => event instanceof NavigationEnd),
        skip(1),
        takeUntilDestroyed(inject(DestroyRef)),
      )
      .subscribe(() => this.focusMain());
  }

  protected skipToMain(event: Event): void {
    // A plain "#main" link would resolve against <base href="/"> and leave the page.
    event.preventDefault();
    this.focusMain();
  }

  protected closeNavIfOverlay(): void {
    if (!this.wide()) void this.sidenav()?.close();
  }

  protected signOut(): void {
    this.auth.signOut().subscribe({
      next: () => void this.router.navigateByUrl('/sign-in'),
      error: () => this.snackBar.open('Signing out failed. Please try again.', 'Dismiss', { duration: 8000 }),
    });
  }

  private focusMain(): void {
    this.document.getElementById('main')?.focus();
  }
}
