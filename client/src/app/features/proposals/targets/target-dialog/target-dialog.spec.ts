import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatButtonToggleGroupHarness } from '@angular/material/button-toggle/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatInputHarness } from '@angular/material/input/testing';
import { TargetDialog } from './target-dialog';

describe('TargetDialog', () => {
  let fixture: ComponentFixture<TargetDialog>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  const close = jest.fn();

  beforeEach(async () => {
    close.mockReset();
    TestBed.configureTestingModule({
      imports: [TargetDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: { proposalId: 5 } },
        { provide: MatDialogRef, useValue: { close } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TargetDialog);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const set = async (name: string, value: string) =>
    (await loader.getHarness(MatInputHarness.with({ selector: `[formControlName=${name}]` }))).setValue(value);
  const text = (selector: string) => (fixture.nativeElement.querySelector(selector) as HTMLElement | null)?.textContent?.trim() ?? null;
  const submit = async () => (await loader.getHarness(MatButtonHarness.with({ text: 'Add target' }))).click();

  async function fillValidRow(): Promise<void> {
    await set('name', 'Lantern X');
    await set('ra', '163.2');
    await set('dec', '31.6');
    await set('magnitude', '12');
    await set('colour', '1.2');
    await set('ageMyr', '650');
  }

  it('opens with Gaia BP−RP chosen, the system named inside the colour field', async () => {
    const toggle = await loader.getHarness(MatButtonToggleGroupHarness);
    const checked = await toggle.getToggles({ checked: true });
    expect(await Promise.all(checked.map((t) => t.getText()))).toEqual(['BP−RP']);
    expect(fixture.nativeElement.querySelector('.colour-field mat-label').textContent).toContain('Colour index BP−RP (mag)');
  });

  it('an implausible B−V shows a warning, not an error, that names the other system; the row can still be saved', async () => {
    await fillValidRow();
    const toggle = await loader.getHarness(MatButtonToggleGroupHarness);
    await (await toggle.getToggles({ text: 'B−V' }))[0].check();
    await set('colour', '2.5');
    expect(text('[data-testid=colour-warning]')).toContain(
      'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
    );
    expect(fixture.nativeElement.querySelector('.colour-field').textContent).toContain('Colour index B−V (mag)');

    // Switching back to BP−RP: 2.5 is a plausible BP−RP, the warning goes.
    await (await toggle.getToggles({ text: 'BP−RP' }))[0].check();
    expect(text('[data-testid=colour-warning]')).toBeNull();

    // A warning never blocks the save.
    await (await toggle.getToggles({ text: 'B−V' }))[0].check();
    await submit();
    const req = backend.expectOne({ method: 'POST', url: '/api/proposals/5/targets' });
    expect(req.request.body).toMatchObject({ colour: 2.5, colourSystem: 'BV' });
    req.flush({ id: 1 });
    expect(close).toHaveBeenCalled();
  });

  it('several bad fields: every one shows its message at once, with what was typed, and a summary names them; nothing sent', async () => {
    await set('ra', '25h');
    await set('dec', '95');
    await set('magnitude', '40');
    await set('ageMyr', '0');
    await set('reddeningEbv', '5');
    await submit();
    backend.expectNone((r) => r.method === 'POST');
    expect(text('[data-testid=error-name]')).toBe('Give the target a name.');
    expect(text('[data-testid=error-ra]')).toBe('Enter a right ascension between 0 and 24 h or between 0° and 360° (you typed 25h).');
    expect(text('[data-testid=error-dec]')).toBe('Enter a declination between −90° and 90° (you typed 95).');
    expect(text('[data-testid=error-magnitude]')).toBe('Enter a magnitude between −2 and 22 mag (you typed 40).');
    expect(text('[data-testid=error-colour]')).toBe('Enter the colour index.');
    expect(text('[data-testid=error-reddeningEbv]')).toBe('Enter an E(B−V) between 0 and 3 mag, or leave it empty (you typed 5).');
    expect(text('[data-testid=error-ageMyr]')).toBe('Enter an age above 0 Myr and at most 14000 Myr (you typed 0).');
    expect(text('[data-testid=fields-to-fix]')).toBe('7 fields need a change: Name, RA, Dec, Magnitude, Colour, Reddening, Age.');
  });

  it('every field error of the server lands on its field; the banner repeats none of them', async () => {
    await fillValidRow();
    await submit();
    backend.expectOne({ method: 'POST', url: '/api/proposals/5/targets' }).flush(
      {
        code: 'validation_failed',
        message: 'magnitude: Enter a magnitude between −2 and 22 mag (you typed 30).',
        fieldErrors: {
          magnitude: ['Enter a magnitude between −2 and 22 mag (you typed 30).'],
          raDeg: ['Enter a right ascension between 0° and 360°, 360° excluded (you typed 400).'],
        },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(text('[data-testid=error-magnitude]')).toBe('Enter a magnitude between −2 and 22 mag (you typed 30).');
    expect(text('[data-testid=error-ra]')).toBe('Enter a right ascension between 0° and 360°, 360° excluded (you typed 400).');
    expect(text('[data-testid=server-error]')).toBeNull();
    expect(text('[data-testid=fields-to-fix]')).toBe('2 fields need a change: RA, Magnitude.');
  });
});
