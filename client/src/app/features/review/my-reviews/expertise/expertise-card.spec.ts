import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader, TestKey } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatAutocompleteHarness } from '@angular/material/autocomplete/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatChipGridHarness, MatChipInputHarness } from '@angular/material/chips/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import type { Expertise } from '@spincycle/shared/review/panels';
import { ExpertiseCard } from './expertise-card';

/** Invented category names. */
const LOADED: Expertise = {
  expertise: ['Open clusters'],
  suggestions: ['Open clusters', 'Planet hosts', 'Flare stars', 'Field dwarfs'],
};

describe('ExpertiseCard', () => {
  let fixture: ComponentFixture<ExpertiseCard>;
  let backend: HttpTestingController;
  let loader: HarnessLoader;

  async function render(body: Expertise | null = LOADED): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ExpertiseCard],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ExpertiseCard);
    loader = TestbedHarnessEnvironment.loader(fixture);
    TestBed.tick();
    if (body) {
      backend.expectOne('/api/review/me/expertise').flush(body);
      await fixture.whenStable();
    }
  }

  afterEach(() => backend.verify());

  const el = () => fixture.nativeElement as HTMLElement;
  const chipTexts = async () => (await (await loader.getHarness(MatChipGridHarness)).getRows()).map((r) => r.getText());
  const texts = async () => Promise.all(await chipTexts());
  const saveButton = () => loader.getHarness(MatButtonHarness.with({ text: 'Save' }));
  const errorText = () => el().querySelector('[data-testid=expertise-error]')?.textContent?.trim() ?? '';
  const statusText = () => el().querySelector('[data-testid=expertise-status]')?.textContent?.trim() ?? '';

  async function typeAndEnter(value: string): Promise<void> {
    const input = await loader.getHarness(MatChipInputHarness);
    await input.setValue(value);
    await input.sendSeparatorKey(TestKey.ENTER);
    await fixture.whenStable();
  }

  it('loading, then the explanation and the declared categories as chips; Save waits for a change', async () => {
    await render(null);
    fixture.detectChanges();
    expect(el().querySelector('mat-progress-bar')).not.toBeNull();
    backend.expectOne('/api/review/me/expertise').flush(LOADED);
    await fixture.whenStable();
    expect(el().querySelector('mat-progress-bar')).toBeNull();
    expect(el().textContent).toContain(
      "The facility prefers reviewers whose expertise matches a proposal's category when it assigns reviewers.",
    );
    expect(await texts()).toEqual(['Open clusters']);
    expect(await (await saveButton()).isDisabled()).toBe(true);
  });

  it('an empty list says so', async () => {
    await render({ expertise: [], suggestions: [] });
    expect(el().textContent).toContain('You have not listed any categories yet.');
  });

  it('a load error shows the message with a retry that reads again', async () => {
    await render(null);
    backend
      .expectOne('/api/review/me/expertise')
      .flush({ code: 'x', message: 'Database down.' }, { status: 503, statusText: 'Unavailable' });
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')?.textContent).toContain('Your expertise could not be loaded. Database down.');
    (el().querySelector('app-load-status button') as HTMLButtonElement).click();
    TestBed.tick();
    backend.expectOne('/api/review/me/expertise').flush(LOADED);
    await fixture.whenStable();
    expect(await texts()).toEqual(['Open clusters']);
  });

  it('the suggestions leave out what is chosen and match the typed text; picking one adds it as a chip', async () => {
    await render();
    const auto = await loader.getHarness(MatAutocompleteHarness);
    await auto.enterText('st');
    const options = await Promise.all((await auto.getOptions()).map((o) => o.getText()));
    // "Open clusters" contains "st" too, but is already chosen.
    expect(options).toEqual(['Planet hosts', 'Flare stars']);
    await auto.selectOption({ text: 'Flare stars' });
    await fixture.whenStable();
    expect(await texts()).toEqual(['Open clusters', 'Flare stars']);
    expect(await auto.getValue()).toBe('');
    expect(statusText()).toBe('Not saved yet.');
  });

  it('keyboard: arrow down to a suggestion and Enter adds that suggestion, not the typed fragment', async () => {
    await render();
    const auto = await loader.getHarness(MatAutocompleteHarness);
    await auto.enterText('fla');
    const input = await (await loader.getHarness(MatChipInputHarness)).host();
    await input.sendKeys(TestKey.DOWN_ARROW);
    await input.sendKeys(TestKey.ENTER);
    await fixture.whenStable();
    expect(await texts()).toEqual(['Open clusters', 'Flare stars']);
    expect(errorText()).toBe('');
  });

  it('a typed name is added with the suggestion’s spelling; a second one ignoring case is refused, naming it', async () => {
    await render();
    await typeAndEnter('planet HOSTS');
    expect(await texts()).toEqual(['Open clusters', 'Planet hosts']);
    await typeAndEnter('Young moving groups');
    expect(await texts()).toEqual(['Open clusters', 'Planet hosts', 'Young moving groups']);
    await typeAndEnter('OPEN CLUSTERS');
    expect(await texts()).toEqual(['Open clusters', 'Planet hosts', 'Young moving groups']);
    expect(errorText()).toBe('“Open clusters” is already in your list.');
    // What was typed stays for the person to correct.
    expect(await (await loader.getHarness(MatChipInputHarness)).getValue()).toBe('OPEN CLUSTERS');
  });

  it('a name over 80 characters is refused with the shared rule’s words', async () => {
    await render();
    const long = 'x'.repeat(81);
    await typeAndEnter(long);
    expect(await texts()).toEqual(['Open clusters']);
    expect(errorText()).toBe(`“${long}” must be at most 80 characters.`);
  });

  it('removing a chip and saving sends the whole list; the answer is shown as saved', async () => {
    await render({ expertise: ['Open clusters', 'Flare stars'], suggestions: LOADED.suggestions });
    const [first] = await (await loader.getHarness(MatChipGridHarness)).getRows();
    await first.remove();
    await fixture.whenStable();
    expect(await texts()).toEqual(['Flare stars']);
    await (await saveButton()).click();
    const req = backend.expectOne('/api/review/me/expertise');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ expertise: ['Flare stars'] });
    await fixture.whenStable();
    expect(statusText()).toBe('Saving…');
    req.flush({ expertise: ['Flare stars'], suggestions: LOADED.suggestions });
    await fixture.whenStable();
    expect(statusText()).toBe('Saved.');
    expect(await (await saveButton()).isDisabled()).toBe(true);
  });

  it('a refusal from the server names the bad entry under the input and keeps the list', async () => {
    await render();
    await typeAndEnter('Planet hosts');
    await (await saveButton()).click();
    backend.expectOne('/api/review/me/expertise').flush(
      {
        code: 'validation_failed',
        message: 'expertise.1: must not contain control characters (such as NUL, line breaks or direction overrides)',
        fieldErrors: { 'expertise.1': ['must not contain control characters (such as NUL, line breaks or direction overrides)'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(errorText()).toBe('“Planet hosts” must not contain control characters (such as NUL, line breaks or direction overrides).');
    expect(statusText()).toContain('Not saved.');
    expect(await texts()).toEqual(['Open clusters', 'Planet hosts']);
    expect(await (await saveButton()).isDisabled()).toBe(false);
  });

  it('a failure without field errors shows the server’s sentence beside Save', async () => {
    await render();
    await typeAndEnter('Planet hosts');
    await (await saveButton()).click();
    backend
      .expectOne('/api/review/me/expertise')
      .flush({ code: 'internal_error', message: 'The server could not complete the request.' }, { status: 500, statusText: 'Error' });
    await fixture.whenStable();
    expect(errorText()).toBe('');
    expect(statusText()).toBe('Not saved. The server could not complete the request.');
  });
});
