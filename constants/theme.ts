// Colours, spacing and type for every screen; screens never hold colour literals.
export const colors = {
  ink: '#14212b',
  inkMuted: '#51606b',
  inkFaint: '#7d8a94',
  paper: '#f4f6f8',
  surface: '#ffffff',
  line: '#d7dde2',
  brand: '#12324a',
  brandSoft: '#e3ecf3',
  accent: '#c98a12',
  pass: '#1d6b3a',
  passSoft: '#e2f2e7',
  fail: '#a3261d',
  failSoft: '#f8e3e1',
  pending: '#6b5310',
  pendingSoft: '#f7efd6',
  info: '#1f4f7a',
  infoSoft: '#e1ecf6',
  chartNominal: '#1f4f7a',
  chartWorst: '#a3261d',
  chartLimit: '#51606b',
  focus: '#2b7bd0',
  /** Dims the screen behind a dialog. */
  scrim: 'rgba(20, 33, 43, 0.55)',
} as const;

/**
 * Measured captures overlaid on one chart, each in its own colour (and its own dash, so colour is never
 * the only difference); none is the nominal blue or the worst-case red. The list repeats after six.
 */
export const measuredPalette = ['#c98a12', '#6a3d9a', '#0f7c7c', '#b3367a', '#5b6b1f', '#8a4b14'] as const;

export const space = { xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32 } as const;

export const radius = { sm: 4, md: 8, lg: 12 } as const;

export const fonts = {
  regular: 'Inter_400Regular',
  medium: 'Inter_500Medium',
  semibold: 'Inter_600SemiBold',
  bold: 'Inter_700Bold',
  mono: 'DejaVuSansMono',
} as const;

export const type = {
  title: { fontFamily: fonts.bold, fontSize: 22, lineHeight: 28, color: colors.ink },
  heading: { fontFamily: fonts.semibold, fontSize: 17, lineHeight: 22, color: colors.ink },
  body: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 21, color: colors.ink },
  small: { fontFamily: fonts.regular, fontSize: 13, lineHeight: 18, color: colors.inkMuted },
  label: { fontFamily: fonts.medium, fontSize: 13, lineHeight: 18, color: colors.inkMuted },
  mono: { fontFamily: fonts.mono, fontSize: 12, lineHeight: 17, color: colors.ink },
} as const;

/** Width from which the app shows a side rail and two columns. */
export const WIDE_BREAKPOINT = 900;
