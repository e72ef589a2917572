import QRCode from 'qrcode';

/** What goes on a valve's printed label. */
export interface LabelContent {
  /** The valve's label, e.g. KL-0007. */
  label: string;
  /** Type designation. */
  type: string;
  /** Maker and date code as printed, if known. */
  maker: string | null;
  dateCode: string | null;
  /** Address of the record in the app, encoded in the QR code. */
  url: string;
}

/** Label size: 50 × 25 mm, a common small label-printer roll. */
const WIDTH_MM = 50;
const HEIGHT_MM = 25;
const MARGIN_MM = 1.5;

function xml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c]!,
  );
}

/** The dark modules of a QR code as one SVG path in module units. */
function qrPath(modules: { size: number; get(row: number, col: number): number }): string {
  const parts: string[] = [];
  for (let row = 0; row < modules.size; row++) {
    for (let col = 0; col < modules.size; col++) {
      if (modules.get(row, col)) parts.push(`M${col} ${row}h1v1h-1z`);
    }
  }
  return parts.join('');
}

/** A monospace glyph is about 0.6 em wide. */
const GLYPH_WIDTH_EM = 0.6;

/** Font size (mm) at which `s` fits `widthMm`, at most `maxMm`: the label is never cut. */
function fitSize(s: string, widthMm: number, maxMm: number): number {
  const size = Math.min(maxMm, widthMm / (GLYPH_WIDTH_EM * Math.max(s.length, 1)));
  return Math.round(size * 100) / 100;
}

/**
 * A printable label as SVG in millimetres: a QR code of the record's address on the left; the
 * label in large type, the valve type, and maker and date code on the right. Error correction
 * level M keeps the code readable with a scuffed corner.
 */
export function valveLabelSvg(c: LabelContent): string {
  const qr = QRCode.create(c.url, { errorCorrectionLevel: 'M' });
  const n = qr.modules.size;
  // Four modules of quiet zone are part of the QR standard.
  const side = HEIGHT_MM - 2 * MARGIN_MM;
  const scale = side / (n + 8);
  const textX = MARGIN_MM + side + 2;
  const textWidth = WIDTH_MM - MARGIN_MM - textX;
  const printed = [c.maker, c.dateCode].filter((s): s is string => !!s).join(' \u00b7 ');
  const text = (y: number, s: string, maxMm: number, bold = false) =>
    `<text x="${textX}" y="${y}" font-size="${fitSize(s, textWidth, maxMm)}"` +
    `${bold ? ' font-weight="bold"' : ''}>${xml(s)}</text>`;
  const lines = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH_MM}mm" height="${HEIGHT_MM}mm"`,
    ` viewBox="0 0 ${WIDTH_MM} ${HEIGHT_MM}" data-url="${xml(c.url)}">`,
    `<title>${xml(c.label)} (${xml(c.type)})</title>`,
    `<rect width="${WIDTH_MM}" height="${HEIGHT_MM}" fill="#fff"/>`,
    `<g transform="translate(${MARGIN_MM + 4 * scale} ${MARGIN_MM + 4 * scale}) scale(${scale})">`,
    `<path d="${qrPath(qr.modules)}" fill="#000"/>`,
    '</g>',
    `<g font-family="DejaVu Sans Mono, Menlo, Consolas, monospace" fill="#000">`,
    text(9, c.label, 5.2, true),
    text(15, c.type, 3.6),
    printed ? text(20, printed, 2.4) : '',
    '</g>',
    '</svg>',
  ];
  return lines.join('') + '\n';
}
