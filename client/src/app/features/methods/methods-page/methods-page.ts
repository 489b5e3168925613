import { ChangeDetectionStrategy, Component, ElementRef, ViewEncapsulation, afterRenderEffect, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { DomSanitizer, type SafeHtml } from '@angular/platform-browser';
import { ActivatedRoute, Router } from '@angular/router';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { MethodsApi } from '../methods-api';
import { renderMethodsMarkdown } from '../methods-markdown';

/**
 * The Methods page: docs/science.md (every formula, source and assumption behind a target
 * plan) rendered as HTML, so that every "how is this computed" link of the product stays inside
 * the app. `/methods#<anchor>` scrolls to the section once the document has loaded; in-page links
 * of the document (`#anchor`) move the fragment through the router instead of reloading.
 */
@Component({
  selector: 'app-methods-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  // The document's HTML is inserted with [innerHTML]: its elements carry no emulated-encapsulation
  // attributes, so the styles are global, scoped by the .methods-doc class instead.
  encapsulation: ViewEncapsulation.None,
  imports: [LoadStatus],
  templateUrl: './methods-page.html',
  styleUrl: './methods-page.scss',
})
export default class MethodsPage {
  private readonly api = inject(MethodsApi);
  private readonly sanitizer = inject(DomSanitizer);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  protected readonly document = this.api.documentResource();
  private readonly fragment = toSignal(this.route.fragment, { initialValue: null });

  protected readonly error = computed(() => (this.document.error() ? 'The methods could not be loaded.' : null));
  protected readonly empty = computed(() => this.document.hasValue() && !this.document.value().trim());
  protected readonly html = computed<SafeHtml | null>(() => {
    // value() throws while the resource is in its error state: ask hasValue() first.
    const markdown = this.document.hasValue() ? this.document.value() : '';
    if (!markdown) return null;
    // Why bypass: the text is the app's own asset (docs/science.md copied by the build), never
    // user input, and Angular's sanitizer would strip the id attributes the section links need.
    return this.sanitizer.bypassSecurityTrustHtml(renderMethodsMarkdown(markdown));
  });

  constructor() {
    afterRenderEffect(() => {
      const id = this.fragment();
      if (!this.html() || !id) return;
      const target = this.host.nativeElement.ownerDocument.getElementById(id);
      target?.scrollIntoView?.({ block: 'start' });
    });
  }

  /** In-page links of the document: keep the router's URL and scroll, instead of a full reload. */
  protected followInPageLink(event: MouseEvent): void {
    if (event.button !== 0 || event.ctrlKey || event.metaKey || event.shiftKey || event.altKey) return;
    const link = (event.target as Element | null)?.closest?.('a[href^="#"]');
    if (!link) return;
    const id = decodeURIComponent(link.getAttribute('href')!.slice(1));
    if (!id) return;
    event.preventDefault();
    void this.router.navigate([], { relativeTo: this.route, fragment: id });
  }
}
