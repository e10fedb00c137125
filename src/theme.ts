import type { GlobalThemeOverrides } from 'naive-ui'

const font = "'IBM Plex Sans', system-ui, sans-serif"

/** Naive UI's theme with the app's font, brand colour and text greys that can be read. */
export const themeOverrides: GlobalThemeOverrides = {
  common: {
    fontFamily: font,
    primaryColor: '#1d4e5f',
    primaryColorHover: '#2a6a80',
    primaryColorPressed: '#163d4a',
    primaryColorSuppl: '#2a6a80',
    // Naive UI's grey for help and feedback lines is 4.2:1 on white; this one is 5.9:1 (WCAG AA
    // asks 4.5:1 for text).
    textColor3: '#5f656b',
  },
  // Its "no data" text is the disabled grey (1.8:1 on white): it is read, so it gets the same.
  Empty: { textColor: '#5f656b' },
}
