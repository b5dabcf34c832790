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
  /** Secondary text on the spruce side navigation (6.8:1 on primary). */
  onPrimaryMuted: '#CFE0DD',
  accent: '#B7791F',
  accentTint: '#F6ECDB',
  /** Text on the ochre tint (warnings, the caution title): 6.1:1 on accentTint. */
  accentInk: '#7A4F12',
  danger: '#A63D32',
  dangerTint: '#F7E4E1',
  success: '#2F6B3A',
  successTint: '#E2EFE4',
  /** Fan-chart bands: tints of the spruce (5–95 lightest, 25–75 stronger); median in ochre. */
  band90: '#CFE0DD',
  band50: '#8DB3AD',
  median: '#B7791F',
  target: '#1D2327',
  /** Borders of inputs and unselected chips (3.5:1 on surface, above WCAG 1.4.11's 3:1). */
  inputBorder: '#8F877B',
  /** Every other row of a long table. */
  stripe: '#FCFBF8',
  /** The line at 1.0 in growth charts. */
  referenceLine: '#B9B2A7',
  shadow: '#000000',
} as const;

/**
 * Funds: muted, earthy hues for stacked areas and fund lines, by the fund's position in the
 * scheme's list of funds (the same position on screen and in PDFs).
 */
export const fundColours = ['#3E7B73', '#D1A054', '#8C7DB3', '#B86F5A', '#6C9BC0', '#9AA65A', '#A8876A', '#5F7480'] as const;

export function fundColour(index: number): string {
  return fundColours[((index % fundColours.length) + fundColours.length) % fundColours.length];
}

/**
 * Options compared side by side have an encoding of their own, never a fund's: a saturated hue
 * from a separate set, a line dash and a marker shape, so they stay apart in grey print too.
 * Hues are at least 5:1 on white.
 */
export type OptionMarker = 'circle' | 'square' | 'triangle' | 'diamond' | 'cross' | 'ring';
export type OptionStyle = { colour: string; dash: number[]; marker: OptionMarker };
export const optionStyles: readonly OptionStyle[] = [
  { colour: '#1B3A6B', dash: [], marker: 'circle' },
  { colour: '#B3203E', dash: [6, 3], marker: 'square' },
  { colour: '#6A2C7A', dash: [2, 3], marker: 'triangle' },
  { colour: '#167A4E', dash: [8, 3, 2, 3], marker: 'diamond' },
  { colour: '#B24A12', dash: [4, 4], marker: 'cross' },
  { colour: '#3A3A3A', dash: [1, 2], marker: 'ring' },
];

/** The style of the option at `index` in a run's list of options (the order the trustee chose). */
export function optionStyle(index: number): OptionStyle {
  return optionStyles[((index % optionStyles.length) + optionStyles.length) % optionStyles.length];
}

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
