// How the instrument panel is drawn (pure, no I/O): one ffmpeg filter chain of lavfi `color`,
// `drawbox` and `drawtext`, plus a `sendcmd` script that re-sets each display's text at its
// refresh instants. sendcmd fires on the first frame whose timestamp reaches a command's time, so
// the output depends only on the timestamps: the same inputs give the same frames on every run,
// which a text file re-read by drawtext (reload=1) would not.
import { DISPLAYS, type DisplayKey, FPS, HEIGHT, type RunTruth, WIDTH } from './scenario';

export interface Fonts {
  /** Labels. */
  regular: string;
  /** Digits. */
  bold: string;
}

interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

interface DigitWindow extends Box {
  key: DisplayKey;
  /** Label printed above the window; the unit is appended. */
  caption: string;
  fontSize: number;
  color: string;
  /** Space kept free at the right of the window (for a unit inside it). */
  rightPad: number;
}

const COLORS = {
  wall: '0x3c4148',
  panel: '0xc9ccc4',
  panelEdge: '0x8a8d86',
  housing: '0x23272b',
  housingText: '0xd6d8d2',
  panelText: '0x1f2326',
  lcd: '0xa9b79a',
  lcdDigits: '0x1c2418',
  ledWindow: '0x0b0c0d',
  ledDigits: '0xff4a3d',
  gaugeFace: '0xf1f1ec',
  gaugeWindow: '0xffffff',
  gaugeDigits: '0x111111',
  lampOff: '0x4d4f52',
  lampOn: '0xffffff',
};

/**
 * Thermometer windows T1–T4 in a row, voltmeter and gauge below. Edges sit on even pixels so the
 * 4:2:0 chroma of a window does not bleed into its frame.
 */
const WINDOWS: readonly DigitWindow[] = [
  ...(['T1', 'T2', 'T3', 'T4'] as const).map((key, i) => ({
    key,
    caption: displayLabel(key),
    x: 116 + i * 270,
    y: 196,
    w: 240,
    h: 124,
    fontSize: 88,
    color: COLORS.lcdDigits,
    rightPad: 18,
  })),
  { key: 'V', caption: 'V FLOW METER SIGNAL', x: 116, y: 456, w: 370, h: 120, fontSize: 88, color: COLORS.ledDigits, rightPad: 62 },
  { key: 'P', caption: 'P STATIC PRESSURE kPa', x: 580, y: 456, w: 260, h: 120, fontSize: 88, color: COLORS.gaugeDigits, rightPad: 18 },
];

/** A rectangle as fractions (0–1) of the frame's width and height: the shape display regions take. */
export interface FrameRegion {
  x: number;
  y: number;
  w: number;
  h: number;
}

/**
 * Each display's digit window as a fraction of the frame, in panel order: what an engineer would
 * draw around the digits, written into the truth file so the seed gives each run its regions
 * from the same boxes the video shows.
 */
export function displayRegions(): Array<{ key: DisplayKey; region: FrameRegion }> {
  return WINDOWS.map((w) => ({ key: w.key, region: { x: w.x / WIDTH, y: w.y / HEIGHT, w: w.w / WIDTH, h: w.h / HEIGHT } }));
}

/**
 * The truth file's display list with each display's digit window added; a display the panel does
 * not draw is refused here rather than left for the seed to find.
 */
export function withRegions<D extends { key: DisplayKey }>(displays: readonly D[]): Array<D & { region: FrameRegion }> {
  const regions = new Map(displayRegions().map((r) => [r.key, r.region]));
  return displays.map((d) => {
    const region = regions.get(d.key);
    if (!region) throw new Error(`display ${d.key} has no digit window on the panel`);
    return { ...d, region };
  });
}

function displayLabel(key: DisplayKey): string {
  const d = DISPLAYS.find((x) => x.key === key)!;
  return `${d.label.toUpperCase()} ${d.unit}`;
}

const LAMP: Box = { x: 960, y: 450, w: 190, h: 150 };

/** Labels carry only characters that need no escaping in a filter graph (no quote, colon, %, backslash). */
const SAFE_TEXT = /^[A-Za-z0-9 °.()=/+-]*$/;

function safeText(text: string): string {
  if (!SAFE_TEXT.test(text)) throw new Error(`panel text "${text}" has characters that would need filter-graph escaping`);
  return text;
}

/**
 * A file path as a filter option value: backslash-escape what the option parser treats specially,
 * then quote it for the graph parser. A single quote cannot be carried through both levels
 * reliably, so such paths are refused.
 */
export function filterPath(p: string): string {
  if (p.includes("'")) throw new Error(`path ${p} contains a single quote; choose another directory`);
  return `'${p.replace(/[\\:]/g, '\\$&')}'`;
}

function box(b: Box, color: string, extra = ''): string {
  return `drawbox=x=${b.x}:y=${b.y}:w=${b.w}:h=${b.h}:color=${color}:t=fill${extra}`;
}

function text(font: string, value: string, x: number | string, y: number | string, size: number, color: string, extra = ''): string {
  return `drawtext=fontfile=${filterPath(font)}:expansion=none:text='${safeText(value)}':x=${x}:y=${y}:fontsize=${size}:fontcolor=${color}${extra}`;
}

function initialText(truth: RunTruth, key: DisplayKey): string {
  const first = truth.updates.find((u) => u.display === key);
  if (!first || first.frame !== 0) throw new Error(`display ${key} has no reading on frame 0`);
  return first.text;
}

/**
 * The whole panel as one filter chain ending in [out]; `commandsFile` is the sendcmd script.
 * Large filled boxes are slow to draw (drawbox blends pixel by pixel), so everything that never
 * changes is drawn once onto a single frame, which `loop` then repeats; per frame only the six
 * readings (and, for half a second, the lamp) are drawn.
 */
export function filterGraph(truth: RunTruth, fonts: Fonts, commandsFile: string): string {
  const lit = `:enable='between(n,${truth.startMarkerFrames[0]},${truth.startMarkerFrames[1]})'`;
  const still: string[] = [
    `color=c=${COLORS.wall}:s=${WIDTH}x${HEIGHT}:r=${FPS}`,
    'trim=end_frame=1',
    box({ x: 60, y: 40, w: 1160, h: 640 }, COLORS.panel),
    `drawbox=x=60:y=40:w=1160:h=640:color=${COLORS.panelEdge}:t=4`,
    text(fonts.bold, 'HEAT-RECOVERY CORE BENCH', 90, 58, 28, COLORS.panelText),
    text(fonts.bold, `RUN ${truth.run}`, 1080, 58, 28, COLORS.panelText),
    // Four-channel thermometer.
    box({ x: 90, y: 105, w: 1100, h: 245 }, COLORS.housing),
    text(fonts.regular, '4-CHANNEL THERMOMETER', 115, 120, 20, COLORS.housingText),
    // Panel voltmeter reading the flow meter.
    box({ x: 90, y: 380, w: 420, h: 280 }, COLORS.housing),
    text(fonts.regular, 'PANEL VOLTMETER', 115, 395, 20, COLORS.housingText),
    text(fonts.regular, 'FLOW METER 0-5 V = 0-200 SLPM', 115, 592, 18, COLORS.housingText),
    text(fonts.regular, `METER ON ${truth.meterStream.toUpperCase()} STREAM`, 115, 620, 18, COLORS.housingText),
    // Dial gauge, shown as its numeric reading.
    box({ x: 555, y: 380, w: 310, h: 280 }, COLORS.gaugeFace),
    `drawbox=x=555:y=380:w=310:h=280:color=${COLORS.panelEdge}:t=3`,
    text(fonts.regular, 'PRESSURE GAUGE', 580, 395, 20, COLORS.panelText),
    text(fonts.regular, 'WARM INLET  0-10 kPa', 580, 592, 18, COLORS.panelText),
    // Sync lamp, unlit.
    box({ x: 910, y: 380, w: 280, h: 280 }, COLORS.housing),
    text(fonts.regular, 'SYNC LAMP', 935, 395, 20, COLORS.housingText),
    box(LAMP, COLORS.lampOff),
  ];
  const readings: string[] = [];
  for (const w of WINDOWS) {
    const isLcd = w.key.startsWith('T');
    const windowColor = isLcd ? COLORS.lcd : w.key === 'V' ? COLORS.ledWindow : COLORS.gaugeWindow;
    const labelColor = isLcd || w.key === 'V' ? COLORS.housingText : COLORS.panelText;
    still.push(box(w, windowColor));
    still.push(text(fonts.regular, w.caption, w.x, w.y - 32, 20, labelColor));
    if (w.key === 'V') still.push(text(fonts.bold, 'V', w.x + w.w - 48, w.y + 52, 44, w.color));
    // Right-aligned like a real display; the name lets sendcmd re-set the text.
    const digits = text(fonts.bold, initialText(truth, w.key), `${w.x + w.w - w.rightPad}-tw`, w.y + 16, w.fontSize, w.color);
    readings.push(digits.replace(/^drawtext=/, `drawtext@${w.key}=`));
  }
  const chain = [
    ...still,
    'format=yuv420p',
    // Repeat the still frame, numbering frames 0, 1, 2, … at 1/fps.
    'loop=loop=-1:size=1:start=0',
    `settb=1/${FPS}`,
    'setpts=N',
    `trim=end_frame=${truth.frameCount}`,
    `sendcmd=f=${filterPath(commandsFile)}`,
    box(LAMP, COLORS.lampOn, lit),
    text(fonts.bold, 'START', `${LAMP.x}+(${LAMP.w}-tw)/2`, `${LAMP.y}+(${LAMP.h}-th)/2`, 44, '0x000000', lit),
    ...readings,
  ];
  return `${chain.join(',')}[out]`;
}

/**
 * sendcmd script: at each refresh instant, re-set the text of every display whose shown text
 * changes. Times are written to the microsecond, the resolution sendcmd compares frame times at.
 */
export function sendcmdScript(truth: RunTruth): string {
  const shown = new Map<DisplayKey, string>();
  const byTime = new Map<number, string[]>();
  for (const u of truth.updates) {
    if (u.frame === 0 && !shown.has(u.display)) {
      shown.set(u.display, u.text);
      continue;
    }
    if (shown.get(u.display) === u.text) continue;
    shown.set(u.display, u.text);
    const micros = Math.round(u.videoTime * 1e6);
    const list = byTime.get(micros) ?? [];
    list.push(`drawtext@${u.display} reinit text=${safeText(u.text)}`);
    byTime.set(micros, list);
  }
  const lines = [...byTime.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([micros, cmds]) => `${(micros / 1e6).toFixed(6)} ${cmds.join(', ')};`);
  return `${lines.join('\n')}\n`;
}

/** Encoder settings of a phone or camera file: H.264 High, long GOP (10 s), B-frames, 90 kHz clock. */
export function cameraEncodeArgs(creationTime: string): string[] {
  return [
    '-c:v', 'libx264',
    '-preset', 'veryfast',
    '-crf', '20',
    '-profile:v', 'high',
    '-pix_fmt', 'yuv420p',
    '-g', '300',
    '-keyint_min', '300',
    '-sc_threshold', '0',
    '-bf', '2',
    // x264 output is deterministic for a fixed thread count, not across counts.
    '-threads', '4',
    '-video_track_timescale', '90000',
    '-fflags', '+bitexact',
    '-flags:v', '+bitexact',
    '-metadata', `creation_time=${creationTime}`,
    '-an',
  ];
}
