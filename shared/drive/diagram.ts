import { figures, type Axis, type Timing } from './timing';
import type { PanelInterface } from './interface';

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => `&#${c.charCodeAt(0)};`);
const fmt = (v: number, digits = 2) => (Number.isInteger(v) ? String(v) : v.toFixed(digits));

interface Track {
  label: string;
  /** Level segments: [start, end, high?] in axis units. */
  segments: [number, number, boolean][];
  kind: 'sync' | 'blank' | 'data' | 'clock';
}

function tracks(a: Axis, syncPositive: boolean, syncName: string, blankName: string, clockLabel?: string): Track[] {
  const syncStart = a.active + a.frontPorch;
  const syncEnd = syncStart + a.sync;
  const syncSeg = (inSync: boolean) => (syncPositive ? inSync : !inSync);
  const list: Track[] = [
    {
      label: syncName,
      kind: 'sync',
      segments: [
        [0, syncStart, syncSeg(false)],
        [syncStart, syncEnd, syncSeg(true)],
        [syncEnd, a.total, syncSeg(false)],
      ],
    },
    {
      label: blankName,
      kind: 'blank',
      segments: [
        [0, a.active, false],
        [a.active, a.total, true],
      ],
    },
    {
      label: 'Active data',
      kind: 'data',
      segments: [
        [0, a.active, true],
        [a.active, a.total, false],
      ],
    },
  ];
  if (clockLabel)
    list.push({
      label: clockLabel,
      kind: 'clock',
      segments: [
        [0, a.active, true],
        [a.active, a.total, false],
      ],
    });
  return list;
}

function panel(title: string, a: Axis, unit: string, duration: string, list: Track[], y0: number, width: number): string {
  const left = 150;
  const plot = width - left - 20;
  const x = (u: number) => left + (u / a.total) * plot;
  const rowH = 34;
  let out = `<text x="12" y="${y0 + 14}" class="title">${esc(title)} — ${a.total} ${unit} (${esc(duration)})</text>`;
  list.forEach((t, i) => {
    const top = y0 + 30 + i * rowH;
    const hi = top + 4;
    const lo = top + 22;
    out += `<text x="12" y="${top + 18}" class="label">${esc(t.label)}</text>`;
    if (t.kind === 'data' || t.kind === 'clock') {
      const [s, e] = t.segments[0];
      out +=
        t.kind === 'data'
          ? `<rect x="${x(s)}" y="${hi}" width="${x(e) - x(s)}" height="${lo - hi}" class="data"/>`
          : `<rect x="${x(s)}" y="${hi}" width="${x(e) - x(s)}" height="${lo - hi}" class="clock"/>`;
      out += `<line x1="${x(e)}" y1="${lo}" x2="${x(a.total)}" y2="${lo}" class="wave"/>`;
      return;
    }
    let d = '';
    for (const [s, e, high] of t.segments) d += `${d ? 'L' : 'M'}${x(s)},${high ? hi : lo} L${x(e)},${high ? hi : lo} `;
    out += `<path d="${d}" class="wave ${t.kind}"/>`;
  });
  const marks = [0, a.active, a.active + a.frontPorch, a.active + a.frontPorch + a.sync, a.total];
  const bottom = y0 + 30 + list.length * rowH;
  for (const m of marks) out += `<line x1="${x(m)}" y1="${y0 + 26}" x2="${x(m)}" y2="${bottom}" class="tick"/>`;
  const spans: [string, number, number][] = [
    [`active ${a.active}`, 0, a.active],
    [`front ${a.frontPorch}`, a.active, a.active + a.frontPorch],
    [`sync ${a.sync}`, a.active + a.frontPorch, a.active + a.frontPorch + a.sync],
    [`back ${a.backPorch}`, a.active + a.frontPorch + a.sync, a.total],
  ];
  // Each measurement on its own row under its span, kept inside the plot at the right edge.
  spans.forEach(([text, s, e], i) => {
    const mid = Math.min((x(s) + x(e)) / 2, width - 20 - text.length * 3.4);
    out += `<text x="${mid}" y="${bottom + 16 + i * 14}" class="measure">${esc(text)}</text>`;
  });
  return out;
}

/**
 * An SVG of one line and one frame of a timing (sync, blanking, active data, and the panel's
 * shift clock when an interface is given) with the measurements written on it. Standalone:
 * its own styles, no external references, so it can be saved and opened anywhere.
 */
export function timingDiagramSvg(t: Timing, iface?: PanelInterface): string {
  const f = figures(t);
  const width = 900;
  const shift = iface ? `Shift clock ÷${iface.pixelsPerClock * (iface.dualScan ? 2 : 1)}` : undefined;
  const line = tracks(t.h, t.hSyncPositive, `HSYNC (${t.hSyncPositive ? '+' : '−'})`, 'H blanking', shift);
  const frame = tracks(t.v, t.vSyncPositive, `VSYNC (${t.vSyncPositive ? '+' : '−'})`, 'V blanking');
  const lineH = 30 + line.length * 34 + 76;
  const height = 40 + lineH + 30 + frame.length * 34 + 76;
  const header = `${t.name} · ${fmt(t.pixelClockMHz, 3)} MHz pixel clock · ${fmt(f.lineRateKHz, 3)} kHz line rate · ${fmt(f.refreshHz, 3)} Hz refresh`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img" aria-label="${esc(`Timing diagram for ${header}`)}">`,
    '<style>text{font:12px sans-serif;fill:#eadfd4}.title{font-weight:600;font-size:13px}.measure{text-anchor:middle;fill:#ffb35c}.label{fill:#cbbdb1}.wave{fill:none;stroke:#ffb35c;stroke-width:2}.wave.blank{stroke:#8fd0ff}.tick{stroke:#5a4e46;stroke-dasharray:3 3}.data{fill:#ffb35c33;stroke:#ffb35c}.clock{fill:url(#clk)}</style>',
    '<defs><pattern id="clk" width="6" height="18" patternUnits="userSpaceOnUse"><path d="M0,18 L0,0 L3,0 L3,18" fill="none" stroke="#c6f27a" stroke-width="1.2"/></pattern></defs>',
    `<rect width="${width}" height="${height}" fill="#15120f"/>`,
    `<text x="12" y="22" class="title">${esc(header)}</text>`,
    panel('One line', t.h, 'pixels', `${fmt(f.linePeriodUs, 3)} µs`, line, 36, width),
    panel('One frame', t.v, 'lines', `${fmt(f.framePeriodMs, 3)} ms`, frame, 36 + lineH, width),
    '</svg>',
  ].join('\n');
}
