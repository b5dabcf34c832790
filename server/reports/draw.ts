import path from 'node:path';
import PDFDocument from 'pdfkit';
import { colors, fundColour, type OptionStyle } from '../../constants/theme';
import { FAN_LEGEND, moneyAxis, potAxisLabel, shareAxis, wholeTicks } from '../../figures';

/**
 * Shared PDF drawing for Keelson's documents: fonts, page furniture, tables and charts drawn
 * as vector graphics. Colours are the app's own (constants/theme.ts); axis ticks and chart words
 * come from figures/, so a chart in a PDF reads like the same chart on screen.
 */
export const PDF_COLORS = {
  ink: colors.ink,
  muted: colors.mutedInk,
  rule: colors.rule,
  primary: colors.primary,
  primaryTint: colors.primaryTint,
  accent: colors.accent,
  accentTint: colors.accentTint,
  accentInk: colors.accentInk,
  danger: colors.danger,
  dangerTint: colors.dangerTint,
  band90: colors.band90,
  band50: colors.band50,
  median: colors.median,
  target: colors.target,
} as const;

const FONT_DIR = path.dirname(require.resolve('@expo-google-fonts/source-sans-3/package.json'));
const FONTS = {
  regular: path.join(FONT_DIR, '400Regular/SourceSans3_400Regular.ttf'),
  semibold: path.join(FONT_DIR, '600SemiBold/SourceSans3_600SemiBold.ttf'),
  bold: path.join(FONT_DIR, '700Bold/SourceSans3_700Bold.ttf'),
};

export type Doc = PDFKit.PDFDocument;

export const MARGIN = 50;
export const FOOTER_SPACE = 36;

export function newDocument(info: { title: string; subject: string }): Doc {
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: MARGIN, bottom: MARGIN, left: MARGIN, right: MARGIN },
    bufferPages: true,
    info: { Title: info.title, Subject: info.subject, Author: 'Keelson', Creator: 'Keelson' },
  });
  doc.registerFont('regular', FONTS.regular);
  doc.registerFont('semibold', FONTS.semibold);
  doc.registerFont('bold', FONTS.bold);
  doc.font('regular').fontSize(10).fillColor(PDF_COLORS.ink);
  return doc;
}

export function toBuffer(doc: Doc): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

export const contentWidth = (doc: Doc) => doc.page.width - MARGIN * 2;
const bottomLimit = (doc: Doc) => doc.page.height - MARGIN - FOOTER_SPACE;

/** Starts a new page unless `height` points still fit on this one. */
export function ensureSpace(doc: Doc, height: number) {
  if (doc.y + height > bottomLimit(doc)) {
    doc.addPage();
    doc.x = MARGIN;
  }
}

export function heading(doc: Doc, text: string, size = 16) {
  ensureSpace(doc, size * 3);
  doc.moveDown(0.6);
  doc.font('bold').fontSize(size).fillColor(PDF_COLORS.primary).text(text, MARGIN, doc.y, { width: contentWidth(doc) });
  doc.moveDown(0.3);
  doc.font('regular').fontSize(10).fillColor(PDF_COLORS.ink);
}

export function paragraph(doc: Doc, text: string, opts: { size?: number; color?: string; font?: 'regular' | 'semibold' | 'bold' } = {}) {
  doc.font(opts.font ?? 'regular').fontSize(opts.size ?? 10);
  const h = doc.heightOfString(text, { width: contentWidth(doc) });
  ensureSpace(doc, h + 4);
  doc.fillColor(opts.color ?? PDF_COLORS.ink).text(text, MARGIN, doc.y, { width: contentWidth(doc) });
  doc.moveDown(0.4);
  doc.font('regular').fontSize(10).fillColor(PDF_COLORS.ink);
}

/** Label–value lines, the label in muted semibold on the left (title pages). */
export function factRows(doc: Doc, rows: [string, string][], opts: { labelWidth?: number; size?: number } = {}) {
  const lw = opts.labelWidth ?? 130;
  const size = opts.size ?? 10.5;
  for (const [k, v] of rows) {
    const y = doc.y;
    doc.font('semibold').fontSize(size).fillColor(PDF_COLORS.muted).text(k, MARGIN, y, { width: lw });
    doc.font('regular').fontSize(size).fillColor(PDF_COLORS.ink).text(v, MARGIN + lw + 10, y, { width: contentWidth(doc) - lw - 10 });
    doc.moveDown(0.5);
  }
}

/** A boxed notice (cautions, draft marking). */
export function noticeBox(doc: Doc, title: string, lines: string[], tone: 'caution' | 'danger' = 'caution') {
  const w = contentWidth(doc);
  const pad = 10;
  doc.fontSize(9.5);
  const textH = lines.reduce((h, l) => h + doc.font('regular').heightOfString(l, { width: w - pad * 2 }) + 3, 0);
  const h = textH + 14 + pad * 2;
  ensureSpace(doc, h + 6);
  const y = doc.y;
  const [bg, border, titleColor] = tone === 'danger' ? [PDF_COLORS.dangerTint, PDF_COLORS.danger, PDF_COLORS.danger] : [PDF_COLORS.accentTint, PDF_COLORS.accent, PDF_COLORS.accentInk];
  doc.save().roundedRect(MARGIN, y, w, h, 6).fillAndStroke(bg, border).restore();
  doc.font('semibold').fontSize(10).fillColor(titleColor).text(title, MARGIN + pad, y + pad, { width: w - pad * 2 });
  let ty = y + pad + 14;
  doc.font('regular').fontSize(9.5).fillColor(PDF_COLORS.ink);
  for (const l of lines) {
    doc.text(l, MARGIN + pad, ty, { width: w - pad * 2 });
    ty = doc.y + 3;
  }
  doc.x = MARGIN;
  doc.y = y + h + 8;
  doc.font('regular').fontSize(10);
}

export type Column = { header: string; width: number; align?: 'left' | 'right' };

/** A table with a header row repeated after each page break; numbers right-aligned. */
export function table(doc: Doc, columns: Column[], rows: string[][], opts: { size?: number } = {}) {
  const size = opts.size ?? 8.5;
  const pad = 3;
  const total = columns.reduce((s, c) => s + c.width, 0);
  const scale = Math.min(1, contentWidth(doc) / total);
  const cols = columns.map((c) => ({ ...c, width: c.width * scale }));
  const rowHeight = (cells: string[], font: string) => {
    doc.font(font).fontSize(size);
    return Math.max(...cells.map((t, i) => doc.heightOfString(t || ' ', { width: cols[i].width - pad * 2 }))) + pad * 2;
  };
  const drawRow = (cells: string[], font: string, fill?: string) => {
    const h = rowHeight(cells, font);
    const y = doc.y;
    if (fill) doc.save().rect(MARGIN, y, total * scale, h).fill(fill).restore();
    let x = MARGIN;
    doc.font(font).fontSize(size).fillColor(PDF_COLORS.ink);
    cells.forEach((t, i) => {
      doc.text(t, x + pad, y + pad, { width: cols[i].width - pad * 2, align: cols[i].align ?? 'left', lineBreak: true });
      x += cols[i].width;
    });
    doc.save().moveTo(MARGIN, y + h).lineTo(MARGIN + total * scale, y + h).lineWidth(0.5).strokeColor(PDF_COLORS.rule).stroke().restore();
    doc.x = MARGIN;
    doc.y = y + h;
  };
  const header = cols.map((c) => c.header);
  ensureSpace(doc, rowHeight(header, 'semibold') + rowHeight(rows[0] ?? header, 'regular'));
  drawRow(header, 'semibold', PDF_COLORS.primaryTint);
  for (const r of rows) {
    if (doc.y + rowHeight(r, 'regular') > bottomLimit(doc)) {
      doc.addPage();
      drawRow(header, 'semibold', PDF_COLORS.primaryTint);
    }
    drawRow(r, 'regular');
  }
  doc.moveDown(0.6);
  doc.font('regular').fontSize(10);
}

type Axes = { x: number; y: number; w: number; h: number; xMin: number; xMax: number; yMax: number };
const sx = (a: Axes, v: number) => a.x + ((v - a.xMin) / (a.xMax - a.xMin || 1)) * a.w;
const sy = (a: Axes, v: number) => a.y + a.h - (Math.min(v, a.yMax) / (a.yMax || 1)) * a.h;

function axes(doc: Doc, a: Axes, xLabel: string, yLabel: string, yTicks: number[], yFmt: (v: number) => string, xTicks: number[]) {
  doc.save().lineWidth(0.5).strokeColor(PDF_COLORS.rule);
  doc.font('regular').fontSize(7).fillColor(PDF_COLORS.muted);
  for (const t of yTicks) {
    const y = sy(a, t);
    doc.moveTo(a.x, y).lineTo(a.x + a.w, y).stroke();
    doc.text(yFmt(t), a.x - 44, y - 4, { width: 40, align: 'right' });
  }
  for (const t of xTicks) doc.text(String(t), sx(a, t) - 15, a.y + a.h + 3, { width: 30, align: 'center' });
  doc.strokeColor(PDF_COLORS.muted).moveTo(a.x, a.y + a.h).lineTo(a.x + a.w, a.y + a.h).stroke();
  doc.fontSize(7.5).text(xLabel, a.x, a.y + a.h + 13, { width: a.w, align: 'center' });
  doc.rotate(-90, { origin: [a.x - 50, a.y + a.h / 2] });
  doc.text(yLabel, a.x - 50 - a.h / 2, a.y + a.h / 2 - 4, { width: a.h, align: 'center' });
  doc.restore();
}

/** A short line in an option's colour and dash, with its marker, as drawn beside its name. */
export function optionSwatch(doc: Doc, x: number, y: number, style: OptionStyle) {
  doc.save().lineWidth(2).strokeColor(style.colour);
  if (style.dash.length) doc.dash(style.dash[0], { space: style.dash[1] ?? style.dash[0] });
  doc.moveTo(x, y).lineTo(x + 22, y).stroke().undash();
  const cx = x + 11;
  const r = 3;
  doc.fillColor(style.colour).strokeColor(style.colour).lineWidth(1.2);
  if (style.marker === 'circle') doc.circle(cx, y, r).fill();
  else if (style.marker === 'ring') doc.circle(cx, y, r).stroke();
  else if (style.marker === 'square') doc.rect(cx - r, y - r, 2 * r, 2 * r).fill();
  else if (style.marker === 'triangle') doc.polygon([cx, y - r - 0.5], [cx + r, y + r - 0.5], [cx - r, y + r - 0.5]).fill();
  else if (style.marker === 'diamond') doc.polygon([cx, y - r - 1], [cx + r + 1, y], [cx, y + r + 1], [cx - r - 1, y]).fill();
  else doc.moveTo(cx - r, y - r).lineTo(cx + r, y + r).moveTo(cx + r, y - r).lineTo(cx - r, y + r).stroke();
  doc.restore();
}

/**
 * A fan chart: the outer and inner percentile bands of the pot in today's money by age, the
 * median in ochre, and the target pot as a dashed line. `summary` is the chart's text alternative.
 */
export function fanChart(
  doc: Doc,
  opts: { title: string; ages: number[]; bands: Record<string, number[]>; target: number | null; currency: string; yMax?: number; option?: OptionStyle; summary: string },
) {
  const totalH = 215;
  ensureSpace(doc, totalH);
  const top = doc.y;
  const titleX = opts.option ? MARGIN + 28 : MARGIN;
  if (opts.option) optionSwatch(doc, MARGIN, top + 6, opts.option);
  doc.font('semibold').fontSize(10).fillColor(PDF_COLORS.ink).text(opts.title, titleX, top, { width: contentWidth(doc) - (titleX - MARGIN) });
  const a: Axes = { x: MARGIN + 56, y: top + 18, w: contentWidth(doc) - 66, h: 140, xMin: opts.ages[0], xMax: opts.ages[opts.ages.length - 1], yMax: 0 };
  const b = opts.bands;
  const axis = moneyAxis(opts.yMax ?? Math.max(...b.p95, opts.target ?? 0) * 1.05, opts.currency);
  a.yMax = axis.max;
  axes(doc, a, 'Age (years)', potAxisLabel(opts.currency), axis.ticks, axis.label, wholeTicks(a.xMin, a.xMax));
  const band = (lo: number[], hi: number[], color: string) => {
    const pts: [number, number][] = [];
    opts.ages.forEach((age, i) => pts.push([sx(a, age), sy(a, hi[i])]));
    for (let i = opts.ages.length - 1; i >= 0; i--) pts.push([sx(a, opts.ages[i]), sy(a, lo[i])]);
    doc.save().polygon(...pts).fill(color).restore();
  };
  band(b.p5, b.p95, PDF_COLORS.band90);
  band(b.p25, b.p75, PDF_COLORS.band50);
  doc.save().lineWidth(1.6).strokeColor(PDF_COLORS.median);
  opts.ages.forEach((age, i) => (i === 0 ? doc.moveTo(sx(a, age), sy(a, b.p50[i])) : doc.lineTo(sx(a, age), sy(a, b.p50[i]))));
  doc.stroke().restore();
  if (opts.target !== null && opts.target > 0) {
    const y = sy(a, opts.target);
    doc.save().lineWidth(0.9).dash(4, { space: 3 }).strokeColor(PDF_COLORS.target).moveTo(a.x, y).lineTo(a.x + a.w, y).stroke().undash().restore();
  }
  // Legend and the chart's key figures as text.
  const ly = a.y + a.h + 26;
  const legend: [string, string][] = [
    [PDF_COLORS.band90, FAN_LEGEND.outer],
    [PDF_COLORS.band50, FAN_LEGEND.inner],
    [PDF_COLORS.median, FAN_LEGEND.median],
    [PDF_COLORS.target, `${FAN_LEGEND.target} (dashed)`],
  ];
  let lx = a.x;
  doc.font('regular').fontSize(7.5).fillColor(PDF_COLORS.muted);
  for (const [c, label] of legend) {
    doc.save().rect(lx, ly + 1, 10, 6).fill(c).restore();
    doc.fillColor(PDF_COLORS.muted).text(label, lx + 13, ly, { lineBreak: false });
    lx += 13 + doc.widthOfString(label) + 14;
  }
  doc.font('regular').fontSize(8.5).fillColor(PDF_COLORS.ink).text(opts.summary, MARGIN, ly + 12, { width: contentWidth(doc) });
  doc.x = MARGIN;
  doc.y = Math.max(doc.y, top + totalH - 10) + 6;
}

/** A glide path as stacked areas of fund weights against years to retirement (left: far from retirement). */
export function glidePathChart(doc: Doc, opts: { title: string; years: number[]; series: { name: string; colourIndex: number; weights: number[] }[] }) {
  const totalH = 170;
  ensureSpace(doc, totalH);
  const top = doc.y;
  doc.font('semibold').fontSize(10).fillColor(PDF_COLORS.ink).text(opts.title, MARGIN, top, { width: contentWidth(doc) });
  const maxY = opts.years[0];
  const a: Axes = { x: MARGIN + 56, y: top + 18, w: contentWidth(doc) - 66 - 130, h: 110, xMin: 0, xMax: maxY, yMax: 1 };
  // Years to retirement decrease left to right; map v → maxY − v.
  const X = (ytr: number) => sx(a, maxY - ytr);
  const share = shareAxis();
  axes(doc, a, 'Years to retirement', 'Share of the pot', share.ticks, share.label, []);
  doc.font('regular').fontSize(7).fillColor(PDF_COLORS.muted);
  for (const t of wholeTicks(0, maxY)) doc.text(String(t), X(t) - 15, a.y + a.h + 3, { width: 30, align: 'center' });
  const cum = new Array(opts.years.length).fill(0) as number[];
  opts.series.forEach((s) => {
    const lower = cum.slice();
    s.weights.forEach((w, i) => (cum[i] += w));
    const pts: [number, number][] = opts.years.map((ytr, i) => [X(ytr), sy(a, cum[i])]);
    for (let i = opts.years.length - 1; i >= 0; i--) pts.push([X(opts.years[i]), sy(a, lower[i])]);
    doc.save().polygon(...pts).fill(fundColour(s.colourIndex)).restore();
  });
  let ly = a.y;
  opts.series.forEach((s) => {
    doc.save().rect(a.x + a.w + 12, ly + 1, 9, 7).fill(fundColour(s.colourIndex)).restore();
    doc.font('regular').fontSize(7.5).fillColor(PDF_COLORS.ink).text(s.name, a.x + a.w + 25, ly, { width: 110 });
    ly = doc.y + 3;
  });
  doc.x = MARGIN;
  doc.y = top + totalH;
}

/** Page footers (and a DRAFT mark across every page when asked), drawn once all pages exist. */
export function finishPages(doc: Doc, footer: string, draft: boolean) {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    if (draft) {
      doc.save();
      doc.rotate(-35, { origin: [doc.page.width / 2, doc.page.height / 2] });
      doc.font('bold').fontSize(110).fillColor(PDF_COLORS.danger).fillOpacity(0.1);
      doc.text('DRAFT', 0, doc.page.height / 2 - 60, { width: doc.page.width, align: 'center', lineBreak: false });
      doc.restore();
    }
    // Writing below the bottom margin must not start a new page.
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc.font('regular').fontSize(7.5).fillColor(PDF_COLORS.muted);
    doc.text(`${footer} · page ${i - range.start + 1} of ${range.count}`, MARGIN, doc.page.height - MARGIN + 8, { width: contentWidth(doc), align: 'center', lineBreak: false });
    doc.page.margins.bottom = bottom;
  }
}
