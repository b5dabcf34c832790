/**
 * Keelson's figures layer: everything between the engine's numbers and what people read.
 * Pure (no I/O, no React, no database): the app, the server's PDFs, CSVs and e-mails all import
 * it, so one figure is rounded and worded the same everywhere. The rules are stated once, in
 * money.ts (money), numbers.ts (percentages, λ, counts), dates.ts (dates and times) and ticks.ts
 * (chart axes).
 */
export * from './money';
export * from './numbers';
export * from './dates';
export * from './ticks';
export * from './caution';
export * from './ranking';
export * from './breakEven';
export * from './comparison';
export * from './charts';
export * from './statement';
export * from './report';
