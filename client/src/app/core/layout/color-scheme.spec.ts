import { TestBed } from '@angular/core/testing';
import { ColorScheme, SCHEME_STORAGE_KEY } from './color-scheme';

describe('ColorScheme', () => {
  const root = document.documentElement;

  beforeEach(() => {
    localStorage.clear();
    root.classList.remove('scheme-light', 'scheme-dark');
  });

  it('no stored choice: follows the system (light in jsdom) and sets no class', () => {
    const scheme = TestBed.inject(ColorScheme);
    expect(scheme.scheme()).toBe('light');
    expect(scheme.followsSystem()).toBe(true);
    expect(root.classList.contains('scheme-dark')).toBe(false);
  });

  it('toggle: switches to dark, stores the choice and marks <html>', () => {
    const scheme = TestBed.inject(ColorScheme);
    scheme.toggle();
    TestBed.tick();
    expect(scheme.isDark()).toBe(true);
    expect(localStorage.getItem(SCHEME_STORAGE_KEY)).toBe('dark');
    expect(root.classList.contains('scheme-dark')).toBe(true);
  });

  it('a stored choice is applied at start; followSystem forgets it', () => {
    localStorage.setItem(SCHEME_STORAGE_KEY, 'dark');
    const scheme = TestBed.inject(ColorScheme);
    expect(scheme.isDark()).toBe(true);
    expect(root.classList.contains('scheme-dark')).toBe(true);
    scheme.followSystem();
    TestBed.tick();
    expect(localStorage.getItem(SCHEME_STORAGE_KEY)).toBeNull();
    expect(root.classList.contains('scheme-dark')).toBe(false);
  });
});
