import type { Browser, Page } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

/** Screenshots looked at by the engineer: /tmp/inputs-<name>.png (and the suite's own folder). */
async function shot(page: Page, name: string): Promise<void> {
  await settled(page);
  await page.screenshot({ path: `/tmp/inputs-${name}.png` });
}

/** Waits until no animation runs (messages fade in: mid-fade they are pale, for people and for axe). */
async function settled(page: Page): Promise<void> {
  await page.waitForFunction(() => document.getAnimations().every((a) => a.playState !== 'running'));
}

/** A new draft of the demo proposer, on its Targets tab, with the target dialog open. */
async function openTargetDialog(page: Page): Promise<void> {
  await signIn(page, 'proposer@halcyon.example');
  await page.goto('/proposals');
  await page.getByRole('heading', { name: 'Proposals', level: 1 }).waitFor();
  await page.getByRole('button', { name: /New proposal/ }).click();
  const create = page.getByRole('dialog');
  await create.getByLabel('Title').fill(`Target inputs ${Date.now()}`);
  await create.getByRole('button', { name: 'Create draft' }).click();
  await page.waitForURL(/\/proposals\/\d+\/overview$/);
  await page.getByRole('tab', { name: 'Targets' }).click();
  await page.getByRole('button', { name: /Add a target/ }).click();
  await page.getByRole('dialog').getByRole('heading', { name: 'Add a target' }).waitFor();
}

describe('the target dialog', () => {
  it('opens with BP−RP, warns on an implausible B−V, and shows every bad field at once (desktop and phone)', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize({ width: 1440, height: 1000 });
      await openTargetDialog(page);
      const dialog = page.getByRole('dialog');

      // BP−RP by default, named inside the colour field.
      const bpRp = dialog.getByRole('radio', { name: 'BP−RP' }).or(dialog.getByRole('button', { name: 'BP−RP', exact: true }));
      await expectChecked(bpRp.first(), true);
      await expectChecked(
        dialog
          .getByRole('radio', { name: 'B−V' })
          .or(dialog.getByRole('button', { name: 'B−V', exact: true }))
          .first(),
        false,
      );
      expect(await dialog.getByLabel(/Colour index BP−RP/).count()).toBe(1);
      await shot(page, 'dialog-default-1440');

      // An implausible B−V: a warning (not an error) that points at the colour system.
      await dialog.getByLabel(/Colour index/).fill('2.5');
      await dialog
        .getByRole('radio', { name: 'B−V' })
        .or(dialog.getByRole('button', { name: 'B−V', exact: true }))
        .first()
        .click();
      const warning = dialog.getByTestId('colour-warning');
      await warning.waitFor();
      expect(await warning.textContent()).toContain(
        'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
      );
      expect(await dialog.getByTestId('error-colour').count()).toBe(0);
      await shot(page, 'colour-warning-1440');
      await settled(page);
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Several bad fields: every message at once, each with what was typed.
      await dialog.getByLabel('RA (J2000)').fill('25h');
      await dialog.getByLabel('Dec (J2000)').fill('95');
      await dialog.getByLabel('Magnitude (mag)').fill('40');
      await dialog.getByLabel('Age (Myr)').fill('0');
      await dialog.getByRole('button', { name: 'Add target' }).click();
      const errors = {
        'error-name': 'Give the target a name.',
        'error-ra': 'Enter a right ascension between 0 and 24 h or between 0° and 360° (you typed 25h).',
        'error-dec': 'Enter a declination between −90° and 90° (you typed 95).',
        'error-magnitude': 'Enter a magnitude between −2 and 22 mag (you typed 40).',
        'error-ageMyr': 'Enter an age above 0 Myr and at most 14000 Myr (you typed 0).',
      };
      for (const [id, text] of Object.entries(errors)) expect((await dialog.getByTestId(id).textContent())?.trim()).toBe(text);
      expect((await dialog.getByTestId('fields-to-fix').textContent())?.trim()).toBe(
        '5 fields need a change: Name, RA, Dec, Magnitude, Age.',
      );
      await shot(page, 'errors-1440');
      await settled(page);
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Phone width: the same dialog, every message still readable.
      await page.setViewportSize({ width: 390, height: 844 });
      await dialog.getByTestId('fields-to-fix').waitFor();
      await shot(page, 'errors-phone');
      await dialog.getByLabel(/Colour index/).scrollIntoViewIfNeeded();
      await shot(page, 'colour-warning-phone');
      await settled(page);
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});

async function expectChecked(toggle: ReturnType<Page['getByRole']>, checked: boolean): Promise<void> {
  const state = (await toggle.getAttribute('aria-checked')) ?? (await toggle.getAttribute('aria-pressed'));
  expect(state).toBe(String(checked));
}
