import type { GlobalThemeOverrides } from 'naive-ui'

const font = "'IBM Plex Sans', system-ui, sans-serif"

/** Naive UI's theme with the app's font and brand colour. */
export const themeOverrides: GlobalThemeOverrides = {
  common: {
    fontFamily: font,
    primaryColor: '#1d4e5f',
    primaryColorHover: '#2a6a80',
    primaryColorPressed: '#163d4a',
    primaryColorSuppl: '#2a6a80',
  },
}
