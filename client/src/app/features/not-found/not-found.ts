import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { RouterLink } from '@angular/router';

@Component({
  selector: 'app-not-found',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, RouterLink],
  template: `
    <div class="page">
      <h1>Page not found</h1>
      <p class="page-lead">There is no page at this address. It may have moved, or the link may be incomplete.</p>
      <a matButton="filled" routerLink="/">Go to the home page</a>
    </div>
  `,
})
export default class NotFound {}
