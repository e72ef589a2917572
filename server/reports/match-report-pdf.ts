import PDFDocument from 'pdfkit';
import type { SweepPoint } from '../../shared/domain/sweep';
import type { MatchReport } from './match-report';

/** One line colour per member, distinct in print and for common colour vision deficiencies. */
const MEMBER_COLOURS = [
  '#0072b2',
  '#d55e00',
  '#009e73',
  '#cc79a7',
  '#e69f00',
  '#56b4e9',
  '#000000',
  '#999933',
];

const MARGIN = 48;

/** Renders a match report as an A4 PDF (vector curves, text kept as text). */
export function renderMatchReportPdf(report: MatchReport): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    info: { Title: `Match report ${report.set.code}`, Author: report.workshop },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const { set } = report;
  const width = doc.page.width - 2 * MARGIN;

  doc.font('Helvetica').fontSize(10).fillColor('#555').text(report.workshop, { align: 'left' });
  doc.moveDown(0.2);
  doc.font('Helvetica-Bold').fontSize(20).fillColor('#000').text(`Match report ${set.code}`);
  doc
    .font('Helvetica')
    .fontSize(11)
    .text(
      `${set.members.length} x ${set.valveType}   |   status ${set.status}   |   ` +
        `matched ${set.createdAt.slice(0, 10)}`,
    );
  doc.moveDown(0.6);

  const f = set.figures;
  const verdict = f.acceptable
    ? `within the tolerance of ${f.tolerancePercent} %`
    : `outside the tolerance of ${f.tolerancePercent} %: ${f.exceeds.join('; ')}`;
  doc.font('Helvetica-Bold').fontSize(11).text('Set figures');
  doc.font('Helvetica').fontSize(10);
  doc.text(
    `Score (largest distance between two members): ${f.scorePercent.toFixed(2)} %, ${verdict}.`,
  );
  for (const p of f.points as Record<string, number | string | null>[]) {
    const ia = p.iaSpreadPercent === null ? 'equal current' : `${fmt(p.iaSpreadPercent, 2)} %`;
    const screen = typeof p.vg2Volts === 'number' ? `, Vg2 ${fmt(p.vg2Volts, 3)} V` : '';
    const where = typeof p.vaVolts === 'number' ? ` (Va ${fmt(p.vaVolts, 3)} V${screen})` : '';
    doc.text(
      `At ${p.label}${where}: mean Ia ${fmt(p.iaMeanMilliamps, 3)} mA, Ia spread ${ia}; ` +
        `mean gm ${fmt(p.gmMeanMicrosiemens, 0)} µS, gm spread ${fmt(p.gmSpreadPercent, 2)} %.`,
    );
  }
  if (f.curveSpreadPercent !== null) {
    doc.text(`Largest curve difference over the window: ${f.curveSpreadPercent.toFixed(2)} %.`);
  }
  doc.moveDown(0.6);

  drawMemberTable(doc, report, width);
  doc.moveDown(0.8);
  drawCurves(doc, report, width);

  doc.moveDown(0.8);
  doc.font('Helvetica-Bold').fontSize(11).fillColor('#000').text('Notes', MARGIN);
  doc.font('Helvetica').fontSize(8.5).fillColor('#333');
  for (const n of report.notes) doc.text(n, { width, paragraphGap: 3 });
  doc.end();
  return done;
}

function fmt(x: unknown, digits: number): string {
  return typeof x === 'number' && Number.isFinite(x) ? x.toFixed(digits) : '-';
}

function drawMemberTable(doc: PDFKit.PDFDocument, report: MatchReport, width: number) {
  const cols = [
    ['', 14],
    ['Label', 62],
    ['Type', 40],
    ['Ia mA', 38],
    ['gm µS', 38],
    ['Grade', 50],
    ['Conditions', 150],
    ['Bench', 48],
    ['Swept', 0],
  ] as const;
  const widths: number[] = cols.map(([, w]) => w);
  const fixed = widths.reduce((a, b) => a + b, 0);
  const last = width - fixed;
  let y = doc.y;
  const row = (cells: string[], bold: boolean, colour: string | null) => {
    let x = MARGIN;
    doc
      .font(bold ? 'Helvetica-Bold' : 'Helvetica')
      .fontSize(8.5)
      .fillColor('#000');
    cells.forEach((c, i) => {
      const w = widths[i] || last;
      if (i === 0 && colour)
        doc
          .rect(x, y + 2, 9, 6)
          .fill(colour)
          .fillColor('#000');
      else doc.text(c, x, y, { width: w - 4, height: 11, ellipsis: true });
      x += w;
    });
    y += 14;
    doc
      .moveTo(MARGIN, y - 3)
      .lineTo(MARGIN + width, y - 3)
      .lineWidth(0.3)
      .stroke('#bbb');
  };
  row(
    cols.map(([h]) => h),
    true,
    null,
  );
  report.set.members.forEach((m, i) => {
    const first = m.readings[0];
    const c = m.conditions;
    const conditions = c
      ? `Va ${c.vaStartVolts}-${c.vaStopVolts} V, Vg1 ${spanVolts(c.vg1Volts)}` +
        `${c.vg2Volts ? `, Vg2 ${c.vg2Volts} V` : ''}, heater ${c.heaterVolts} V`
      : '-';
    const grade = m.grade
      ? `${m.grade}${m.gradePercent !== null ? ` ${Math.round(m.gradePercent)} %` : ''}`
      : '-';
    row(
      [
        '',
        m.label,
        m.valveType,
        fmt(first?.iaMilliamps, 3),
        fmt(first?.gmMicrosiemens, 0),
        grade,
        conditions,
        m.bench ?? '-',
        m.sweptAt?.slice(0, 10) ?? '-',
      ],
      false,
      MEMBER_COLOURS[i % MEMBER_COLOURS.length],
    );
  });
  doc.x = MARGIN;
  doc.y = y + 2;
  if (report.set.members[0]?.readings[0]) {
    doc
      .font('Helvetica')
      .fontSize(8)
      .fillColor('#555')
      .text(`Ia and gm at ${report.set.members[0].readings[0].label}.`, MARGIN);
  }
}

function drawCurves(doc: PDFKit.PDFDocument, report: MatchReport, width: number) {
  const families = report.set.members.map((m) => report.families.get(m.valveId) ?? []);
  const all = families.flat();
  if (all.length === 0) return;
  const vaMax = niceCeil(Math.max(...all.map((p) => p.vaVolts)));
  const iaMax = niceCeil(Math.max(...all.map((p) => p.iaMilliamps)));
  const left = MARGIN + 40;
  const plotW = width - 50;
  const plotH = 230;
  if (doc.y + plotH + 60 > doc.page.height - MARGIN) doc.addPage();
  doc.font('Helvetica-Bold').fontSize(11).fillColor('#000').text('Anode curves', MARGIN);
  const top = doc.y + 8;
  const x = (va: number) => left + (va / vaMax) * plotW;
  const y = (ia: number) => top + plotH - (ia / iaMax) * plotH;

  doc.lineWidth(0.3).strokeColor('#ddd');
  doc.font('Helvetica').fontSize(7.5).fillColor('#444');
  for (let k = 0; k <= 5; k++) {
    const va = (vaMax * k) / 5;
    const ia = (iaMax * k) / 5;
    doc
      .moveTo(x(va), top)
      .lineTo(x(va), top + plotH)
      .stroke();
    doc
      .moveTo(left, y(ia))
      .lineTo(left + plotW, y(ia))
      .stroke();
    doc.text(trim(va), x(va) - 15, top + plotH + 3, { width: 30, align: 'center' });
    doc.text(trim(ia), left - 34, y(ia) - 3, { width: 30, align: 'right' });
  }
  doc.lineWidth(0.8).strokeColor('#000').rect(left, top, plotW, plotH).stroke();
  doc.fontSize(8.5).fillColor('#000');
  doc.text('Va V', left + plotW - 40, top + plotH + 14, { width: 40, align: 'right' });
  doc.text('Ia mA', left - 38, top - 12, { width: 40 });

  families.forEach((family, i) => {
    doc.lineWidth(0.9).strokeColor(MEMBER_COLOURS[i % MEMBER_COLOURS.length]);
    for (const curve of byCurve(family)) {
      curve.forEach((p, k) => {
        const px = x(p.vaVolts);
        const py = y(Math.min(p.iaMilliamps, iaMax));
        if (k === 0) doc.moveTo(px, py);
        else doc.lineTo(px, py);
      });
      doc.stroke();
    }
  });

  let lx = left;
  const ly = top + plotH + 28;
  report.set.members.forEach((m, i) => {
    doc.lineWidth(2).strokeColor(MEMBER_COLOURS[i % MEMBER_COLOURS.length]);
    doc
      .moveTo(lx, ly + 4)
      .lineTo(lx + 16, ly + 4)
      .stroke();
    doc
      .fillColor('#000')
      .fontSize(8.5)
      .text(m.label, lx + 20, ly, { lineBreak: false });
    lx += 30 + doc.widthOfString(m.label);
  });
  const vg1 = [...new Set(all.map((p) => p.vg1Volts))].sort((a, b) => b - a);
  doc.x = MARGIN;
  doc.y = ly + 16;
  doc
    .fontSize(8)
    .fillColor('#555')
    .text(`Curves at Vg1 = ${vg1.map(trim).join(', ')} V (top to bottom).`, MARGIN);
}

function byCurve(points: readonly SweepPoint[]): SweepPoint[][] {
  const m = new Map<number, SweepPoint[]>();
  for (const p of points) m.set(p.curve, [...(m.get(p.curve) ?? []), p]);
  return [...m.values()].map((c) => c.sort((a, b) => a.vaVolts - b.vaVolts));
}

function niceCeil(x: number): number {
  if (!(x > 0)) return 1;
  const e = 10 ** Math.floor(Math.log10(x));
  for (const m of [1, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) if (m * e >= x) return m * e;
  return 10 * e;
}

function spanVolts(vg1: readonly number[]): string {
  const lo = Math.min(...vg1);
  const hi = Math.max(...vg1);
  return lo === hi ? `${trim(lo)} V` : `${trim(hi)} to ${trim(lo)} V`;
}

function trim(x: number): string {
  return String(Number(x.toPrecision(4)));
}
