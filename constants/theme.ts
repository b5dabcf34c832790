/**
 * Keelson's visual identity, defined once. Contrast: ink on paper 14.9:1,
 * muted ink on paper 5.6:1, white on spruce 9.3:1, white on danger 6.3:1 (WCAG AA ≥ 4.5:1).
 */
export const colors = {
  paper: '#FAF7F2',
  surface: '#FFFFFF',
  ink: '#1D2327',
  mutedInk: '#5B6770',
  rule: '#E3DED6',
  primary: '#1F4E4A',
  primaryPressed: '#163935',
  primaryTint: '#E4EEEC',
  onPrimary: '#FFFFFF',
  accent: '#B7791F',
  accentTint: '#F6ECDB',
  danger: '#A63D32',
  dangerTint: '#F7E4E1',
  success: '#2F6B3A',
  successTint: '#E2EFE4',
  /** Fan-chart bands: tints of the spruce (5–95 lightest, 25–75 stronger); median in ochre. */
  band90: '#CFE0DD',
  band50: '#8DB3AD',
  median: '#B7791F',
  target: '#1D2327',
  /** Qualitative set for options compared side by side (distinct hue and lightness). */
  series: ['#1F4E4A', '#B7791F', '#5A4E9A', '#A63D32', '#3F7FA6', '#6B7F2A'],
} as const;

export const space = { xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32 } as const;
export const radius = { sm: 4, md: 8, lg: 12 } as const;

export const fonts = {
  regular: 'SourceSans3_400Regular',
  semibold: 'SourceSans3_600SemiBold',
  bold: 'SourceSans3_700Bold',
} as const;

/** Type scale (px): a 1.2 ratio around a 16 px body. */
export const type = {
  caption: { fontFamily: fonts.regular, fontSize: 13, lineHeight: 18 },
  body: { fontFamily: fonts.regular, fontSize: 16, lineHeight: 24 },
  label: { fontFamily: fonts.semibold, fontSize: 14, lineHeight: 20 },
  title: { fontFamily: fonts.semibold, fontSize: 20, lineHeight: 28 },
  heading: { fontFamily: fonts.bold, fontSize: 28, lineHeight: 34 },
  /** Numbers in tables: tabular figures, right-aligned by the table. */
  figure: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 22, fontVariant: ['tabular-nums' as const] },
} as const;

/** Below this width the shell shows bottom navigation; from it, a side navigation. */
export const WIDE_BREAKPOINT = 768;
export const MIN_TOUCH = 44;
