import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

// useTheme keeps one theme per page in module state, so each test loads a fresh copy of the module.
async function loadUseTheme() {
  vi.resetModules();
  return (await import('@/composables/useTheme')).useTheme;
}

function prefersDark(isDark: boolean): void {
  vi.stubGlobal('matchMedia', (query: string) => ({
    matches: query.includes('dark') ? isDark : false,
    media: query,
    addEventListener: vi.fn(),
    removeEventListener: vi.fn(),
  }));
}

describe('useTheme', () => {
  beforeEach(() => {
    localStorage.clear();
    document.documentElement.classList.remove('dark');
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  it('when nothing is saved and the system prefers dark, then starts dark', async () => {
    prefersDark(true);
    const { isDark } = (await loadUseTheme())();
    expect(isDark.value).toBe(true);
    expect(document.documentElement.classList.contains('dark')).toBe(true);
  });

  it('when a light choice is saved, then it wins over the system preference', async () => {
    prefersDark(true);
    localStorage.setItem('gw-theme', 'light');
    const { isDark } = (await loadUseTheme())();
    expect(isDark.value).toBe(false);
    expect(document.documentElement.classList.contains('dark')).toBe(false);
  });

  it('when toggled, then switches the html class and saves the choice for the next visit', async () => {
    // Arrange
    prefersDark(false);
    const useTheme = await loadUseTheme();
    const { isDark, toggle } = useTheme();
    // Act
    toggle();
    // Assert
    expect(isDark.value).toBe(true);
    expect(document.documentElement.classList.contains('dark')).toBe(true);
    expect(localStorage.getItem('gw-theme')).toBe('dark');
    // A second caller on the same page sees the same theme.
    expect(useTheme().isDark.value).toBe(true);
    toggle();
    expect(localStorage.getItem('gw-theme')).toBe('light');
    expect(document.documentElement.classList.contains('dark')).toBe(false);
  });
});
