import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { METHODS_DOCUMENT_URL } from '../methods-api';
import MethodsPage from './methods-page';

// marked ships only an ES module as its main entry, which this jest setup does not transform;
// its UMD build is the same code in a form jest loads directly.
jest.mock('marked', () => jest.requireActual('../../../../../../node_modules/marked/lib/marked.umd.js'));

const MARKDOWN = [
  '# How Spincycle computes a target plan',
  '',
  'See the [completeness](#completeness) section.',
  '',
  '<a id="overview"></a>',
  '## 1. The chain',
  '',
  '| step | what |',
  '|---|---|',
  '| 1 | colour |',
  '',
  '<a id="completeness"></a>',
  '## 20. Detection probability (completeness)',
  '',
  '`λ = n·A²/(2σ²)`',
].join('\n');

describe('MethodsPage', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;
  let scrolledTo: string[];

  beforeEach(async () => {
    scrolledTo = [];
    // jsdom has no layout: record which element the page asks to scroll into view.
    Element.prototype.scrollIntoView = function (this: Element) {
      scrolledTo.push(this.id);
    };
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([{ path: 'methods', component: MethodsPage }])],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
  });

  afterEach(() => backend.verify());

  const root = () => harness.routeNativeElement as HTMLElement;
  const all = (selector: string) => Array.from(root().querySelectorAll(selector));

  /** Lets the navigation and the first render run without waiting for the pending request (whenStable would). */
  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve, 0));
    TestBed.tick();
  }

  async function open(url: string, body: string | null): Promise<void> {
    const navigation = harness.navigateByUrl(url);
    await settle();
    const request = backend.expectOne(METHODS_DOCUMENT_URL);
    if (body === null) request.flush('missing', { status: 404, statusText: 'Not Found' });
    else request.flush(body);
    await navigation;
    await harness.fixture.whenStable();
    harness.detectChanges();
  }

  it('while loading: a progress bar and the page heading', async () => {
    const navigation = harness.navigateByUrl('/methods');
    await settle();
    expect(all('mat-progress-bar')).toHaveLength(1);
    expect(root().querySelector('h1')?.textContent).toBe('Methods');
    backend.expectOne(METHODS_DOCUMENT_URL).flush(MARKDOWN);
    await navigation;
  });

  it('loaded: the document as HTML, one h1, section headings, tables, and the anchors kept', async () => {
    await open('/methods', MARKDOWN);
    expect(all('mat-progress-bar')).toHaveLength(0);
    expect(all('h1').map((h) => h.textContent)).toEqual(['How Spincycle computes a target plan']);
    expect(all('h2').map((h) => h.textContent)).toEqual(['1. The chain', '20. Detection probability (completeness)']);
    expect(all('table td').map((td) => td.textContent)).toEqual(['1', 'colour']);
    expect(root().querySelector('a#completeness')).not.toBeNull();
    expect(root().querySelector('a#overview')).not.toBeNull();
    expect(root().querySelector('code')?.textContent).toBe('λ = n·A²/(2σ²)');
  });

  it('/methods#completeness: scrolls to that section once the document has loaded', async () => {
    await open('/methods#completeness', MARKDOWN);
    expect(scrolledTo).toContain('completeness');
  });

  it('an in-page link: moves the fragment through the router (no reload) and scrolls there', async () => {
    await open('/methods', MARKDOWN);
    const link = root().querySelector<HTMLAnchorElement>('a[href="#completeness"]')!;
    const event = new MouseEvent('click', { bubbles: true, cancelable: true, button: 0 });
    link.dispatchEvent(event);
    expect(event.defaultPrevented).toBe(true);
    await harness.fixture.whenStable();
    harness.detectChanges();
    expect(TestBed.inject(Router).url).toBe('/methods#completeness');
    expect(scrolledTo).toContain('completeness');
  });

  it('load error: an alert with a retry button, and still a page heading', async () => {
    await open('/methods', null);
    const alert = root().querySelector('[role=alert]');
    expect(alert?.textContent).toContain('The methods could not be loaded.');
    expect(alert?.querySelector('button')?.textContent).toContain('Try again');
    expect(root().querySelector('h1')?.textContent).toBe('Methods');
    expect(root().querySelector('[data-testid=methods-doc]')).toBeNull();
  });
});
