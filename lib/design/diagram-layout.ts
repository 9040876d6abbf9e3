/**
 * Layout of the design diagram: a pure function from a design to boxes, labels and markers that
 * `components/design/design-diagram.tsx` draws as SVG (and tests check without a browser).
 *
 * The picture has one band per level, top to bottom. A left column names each band ("20
 * classrooms (10 per arm)", "25 pupils per classroom"), says what kind of level it is and carries
 * the markers "treatment assigned here" and "outcome measured here". On the right, units are drawn
 * as nested boxes: at most 3 per parent, followed by "…" when there are more, so the number of
 * boxes stays small (at most MAX_BOXES) whatever the counts. When space runs short on deep designs
 * the first unit of each parent is drawn wider and its siblings narrower, and a unit too narrow to
 * hold its children is drawn closed.
 *
 * Outline shows the level kind (solid: independent units, thick: grouping, dashed: repeated
 * measurements, dotted: replicates). At the level of assignment the drawn units alternate between
 * the arms; lower levels inherit their parent's arm.
 */
import type { Design, Level } from './schema';
import { designFacts, unitsByArm, type DesignFacts, type LevelInfo } from './facts';
import { formatCount, nounFor } from '@/lib/format';

export { formatCount };

export type LevelKind = Level['kind'];

export interface DiagramBox {
  x: number;
  y: number;
  w: number;
  h: number;
  levelIndex: number;
  kind: LevelKind;
  /** Index of the arm the unit belongs to (at or below the level of assignment). */
  arm?: number;
  /** The box is a unit of the level of assignment. */
  assigned?: boolean;
  /** The unit has children that are not drawn for lack of room. */
  closed?: boolean;
}

export type LabelRole = 'band' | 'caption' | 'arm' | 'legend' | 'totals' | 'message';

export interface DiagramLabel {
  x: number;
  y: number;
  text: string;
  anchor: 'start' | 'middle' | 'end';
  weight?: 'normal' | 'bold';
  role: LabelRole;
  /** Font size in px (12 or more). */
  size: number;
  /** Draw a pale background behind the text (labels over patterned fills). */
  background?: boolean;
}

export interface DiagramMarker {
  type: 'more' | 'assigned' | 'measured';
  /** The text broken into lines that fit (pills in narrow diagrams take two lines). */
  lines: string[];
  x: number;
  y: number;
  w: number;
  h: number;
  text: string;
  levelIndex: number;
}

export interface DiagramSwatch {
  x: number;
  y: number;
  w: number;
  h: number;
  arm: number;
}

export interface DiagramBand {
  levelIndex: number;
  y: number;
  h: number;
}

export interface DiagramLayout {
  width: number;
  height: number;
  boxes: DiagramBox[];
  labels: DiagramLabel[];
  markers: DiagramMarker[];
  swatches: DiagramSwatch[];
  bands: DiagramBand[];
  /** Arm names, in order (index = `arm` of boxes and swatches). */
  arms: string[];
  totals: string;
  description: string[];
  /** Nothing to draw: the design has no levels. */
  empty: boolean;
}

export interface LayoutOptions {
  width?: number;
}

/** Upper bound on drawn boxes, whatever the design. */
export const MAX_BOXES = 180;
/** Units drawn per parent at most. */
export const DRAWN_PER_PARENT = 3;

const MARGIN = 12;
const PAD = 4;
const GAP = 4;
const MORE_W = 14;
const MIN_LEAF = 12;
const MIN_SIB = 14;
const COMFY_LEAF = 28;
const BAND_SIZE = 13;
const CAPTION_SIZE = 12;
const BAND_LINE = 17;
const CAPTION_LINE = 16;
const PILL_H = 20;
const MIN_BAND_H = 56;

const KIND_CAPTION: Record<LevelKind, string> = {
  independent: 'Independent units · solid outline',
  grouping: 'Groups of units · thick outline',
  repeated: 'Repeated measurements · dashed outline',
  replicate: 'Replicates of one sample · dotted outline',
};

const KIND_SENTENCE: Record<LevelKind, string> = {
  independent: 'independent units',
  grouping: 'groups of units',
  repeated: 'repeated measurements of the unit above',
  replicate: 'technical replicates or sub-samples of the unit above',
};

// ---------------------------------------------------------------- text helpers

function isWhole(n: number): boolean {
  return Math.abs(n - Math.round(n)) < 1e-9;
}

/** Lower-case the first letter unless the word looks like an acronym ("ICU"). */
function lowerName(name: string): string {
  if (name.length > 1 && name.charAt(1) === name.charAt(1).toUpperCase() && name.charAt(1) !== name.charAt(1).toLowerCase()) return name;
  return name.charAt(0).toLowerCase() + name.slice(1);
}

/** "classroom" / "classrooms"; pluralises the last word of a multi-word name. */
export function unitName(name: string, n: number): string {
  const base = lowerName(name.trim());
  return nounFor(isWhole(n) ? Math.round(n) : n, base);
}

function counted(n: number, name: string): string {
  return `${formatCount(n)} ${unitName(name, n)}`;
}

function estWidth(text: string, size: number, bold = false): number {
  return text.length * size * (bold ? 0.64 : 0.58);
}

/** Greedy word wrap by estimated text width. */
export function wrapText(text: string, maxWidth: number, size: number, bold = false): string[] {
  const words = text.split(/\s+/).filter(Boolean);
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    const next = line ? `${line} ${w}` : w;
    if (line && estWidth(next, size, bold) > maxWidth) {
      lines.push(line);
      line = w;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines.length ? lines : [''];
}

function listJoin(items: string[]): string {
  if (items.length <= 1) return items.join('');
  if (items.length === 2) return `${items[0]} and ${items[1]}`;
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

export function armLetter(i: number): string {
  return String.fromCharCode(65 + (i % 26));
}

// ---------------------------------------------------------------- arms

interface ArmInfo {
  names: string[];
  /** Units of the assignment level per arm. */
  perArm: number[];
  /** "10 per arm" or "12 Programme, 6 Control". */
  text: string;
}

function armInfo(f: DesignFacts, assigned: LevelInfo | undefined): ArmInfo | undefined {
  const arms = f.design.assignment.arms;
  if (!assigned || arms.length === 0) return undefined;
  const perArm = unitsByArm(f, assigned);
  const equal = perArm.every((p) => Math.abs(p - perArm[0]!) < 1e-9);
  const text = equal
    ? `${formatCount(perArm[0]!)} per arm`
    : perArm.map((p, i) => `${formatCount(p)} ${arms[i]!.name}`).join(', ');
  return { names: arms.map((a) => a.name), perArm, text };
}

// ---------------------------------------------------------------- box geometry

interface Slot {
  x: number;
  w: number;
}

interface LevelPlan {
  /** Units per parent rounded up (the top level: all units). */
  count: number;
  drawn: number;
}

function planLevels(totals: LevelInfo[]): LevelPlan[] {
  return totals.map((t) => {
    const count = Math.max(1, Math.ceil(t.perParent - 1e-9));
    return { count, drawn: Math.min(DRAWN_PER_PARENT, count) };
  });
}

/** Smallest width of a box of level d that still shows one child (and "…"). */
function minNeeds(plans: LevelPlan[]): number[] {
  const n = plans.length;
  const need = new Array<number>(n).fill(MIN_LEAF);
  for (let d = n - 2; d >= 0; d--) {
    need[d] = 2 * PAD + need[d + 1]! + (plans[d + 1]!.count > 1 ? GAP + MORE_W : 0);
  }
  return need;
}

/** Width of a box of level d that shows all its drawn children at ease. */
function comfyNeeds(plans: LevelPlan[]): number[] {
  const n = plans.length;
  const need = new Array<number>(n).fill(COMFY_LEAF);
  for (let d = n - 2; d >= 0; d--) {
    const c = plans[d + 1]!;
    need[d] = 2 * PAD + c.drawn * need[d + 1]! + (c.drawn - 1) * GAP + (c.count > c.drawn ? GAP + MORE_W : 0);
  }
  return need;
}

/**
 * Slots for the children of level d within an inner width, plus whether "…" follows.
 * Returns no slots when even one child does not fit.
 */
function childSlots(
  x0: number,
  width: number,
  d: number,
  plans: LevelPlan[],
  minNeed: number[],
  comfy: number[],
  /** At the level of assignment: show several units (the arms) rather than depth. */
  preferSiblings = false,
): { slots: Slot[]; more: Slot | undefined } {
  const { count, drawn } = plans[d]!;
  const last = d === plans.length - 1;
  for (let k = drawn; k >= 1; k--) {
    const hasMore = count > k;
    const moreSlot = hasMore ? GAP + MORE_W : 0;
    const avail = width - moreSlot - (k - 1) * GAP;
    if (avail <= 0) continue;
    let widths: number[] | undefined;
    const equal = avail / k;
    if (last) {
      if (equal >= MIN_LEAF) widths = new Array(k).fill(equal);
    } else if (equal >= comfy[d]! || (k === 1 && equal >= minNeed[d]!)) {
      widths = new Array(k).fill(equal);
    } else if (k > 1) {
      const sib0 = Math.max(MIN_SIB, avail * 0.18);
      const w1 = Math.max(minNeed[d]!, avail - (k - 1) * sib0);
      const sib = (avail - w1) / (k - 1);
      if (sib >= MIN_SIB && w1 >= minNeed[d]!) widths = [w1, ...new Array(k - 1).fill(sib)];
      else if (preferSiblings) {
        const first = avail - (k - 1) * sib0;
        if (first >= MIN_SIB) widths = [first, ...new Array(k - 1).fill(sib0)];
        else if (avail / k >= MIN_SIB) widths = new Array(k).fill(avail / k);
      }
    }
    if (!widths) continue;
    const slots: Slot[] = [];
    let x = x0;
    for (const w of widths) {
      slots.push({ x, w });
      x += w + GAP;
    }
    const more = hasMore ? { x: x0 + width - MORE_W, w: MORE_W } : undefined;
    return { slots, more };
  }
  return { slots: [], more: undefined };
}

const round = (v: number) => Math.round(v * 10) / 10;

// ---------------------------------------------------------------- layout

export function layoutDiagram(design: Design, options: LayoutOptions = {}): DiagramLayout {
  const width = Math.max(280, Math.round(options.width ?? 640));
  const f = designFacts(design);
  const totals = f.levels;
  const labels: DiagramLabel[] = [];
  const markers: DiagramMarker[] = [];
  const boxes: DiagramBox[] = [];
  const swatches: DiagramSwatch[] = [];
  const bands: DiagramBand[] = [];

  if (totals.length === 0) {
    const msg = ['No levels yet.', 'Add the levels of your study in the Structure step to see the diagram here.'];
    let y = MARGIN + 18;
    wrapText(msg[0]!, width - 2 * MARGIN, BAND_SIZE, true).forEach((line) => {
      labels.push({ x: width / 2, y, text: line, anchor: 'middle', weight: 'bold', role: 'message', size: BAND_SIZE });
      y += BAND_LINE;
    });
    wrapText(msg[1]!, width - 2 * MARGIN, CAPTION_SIZE).forEach((line) => {
      labels.push({ x: width / 2, y, text: line, anchor: 'middle', role: 'message', size: CAPTION_SIZE });
      y += CAPTION_LINE;
    });
    return {
      width,
      height: Math.round(y + MARGIN),
      boxes,
      labels,
      markers,
      swatches,
      bands,
      arms: [],
      totals: 'No observations yet: the design has no levels.',
      description: ['The design has no levels yet, so there is nothing to draw.', msg[1]!],
      empty: true,
    };
  }

  const n = totals.length;
  const assigned = f.assignment;
  const aIndex = assigned?.index;
  const measured = f.bottom!;
  const arms = armInfo(f, assigned);
  const nArms = arms?.names.length ?? 0;
  const continuous = design.assignment.kind === 'continuous';

  // ---- left column: band texts
  const gutterW = Math.round(Math.min(300, Math.max(150, width * 0.4)));
  const textW = gutterW - MARGIN;
  const picX = MARGIN + gutterW + 8;
  const picW = width - MARGIN - picX;

  const bandTexts = totals.map((t) => {
    const name = t.level.name;
    let text: string;
    if (t.index === 0) text = counted(t.total, name);
    else text = `${formatCount(t.perParent)} ${unitName(name, t.perParent)} per ${unitName(totals[t.index - 1]!.level.name, 1)}`;
    if (t.index === aIndex && arms) text += t.index === 0 ? ` (${arms.text})` : ` (${formatCount(t.total)} in all, ${arms.text})`;
    else if (t.index === aIndex && t.index > 0) text += ` (${formatCount(t.total)} in all)`;
    const pills: DiagramMarker['type'][] = [];
    if (t.index === aIndex) pills.push('assigned');
    if (t.index === measured.index) pills.push('measured');
    return {
      lines: wrapText(text, textW, BAND_SIZE, true),
      caption: wrapText(KIND_CAPTION[t.level.kind], textW, CAPTION_SIZE),
      pills,
    };
  });

  let y = MARGIN;
  const bandTop: number[] = [];
  const bandH: number[] = [];
  bandTexts.forEach((b, d) => {
    const pills = b.pills.map((p) => {
      const text = p === 'assigned' ? (continuous ? 'exposure varies here' : 'treatment assigned here') : 'outcome measured here';
      const lines = wrapText(`▸ ${text}`, textW - 20, CAPTION_SIZE, true);
      const w = Math.min(textW, Math.ceil(Math.max(...lines.map((l) => estWidth(l, CAPTION_SIZE, true))) + 20));
      return { type: p, text, lines, w, h: PILL_H + (lines.length - 1) * 14 };
    });
    let h = 10 + b.lines.length * BAND_LINE + b.caption.length * CAPTION_LINE + pills.reduce((sum, p) => sum + p.h + 4, 0) + 6;
    h = Math.max(h, MIN_BAND_H);
    if (d === n - 1) h = Math.max(h, 36 + (n - 1) * PAD);
    bandTop.push(y);
    bandH.push(h);
    bands.push({ levelIndex: d, y, h });
    let ty = y + 10 + BAND_SIZE;
    for (const line of b.lines) {
      labels.push({ x: MARGIN, y: ty, text: line, anchor: 'start', weight: 'bold', role: 'band', size: BAND_SIZE });
      ty += BAND_LINE;
    }
    ty -= BAND_LINE - CAPTION_LINE;
    for (const line of b.caption) {
      labels.push({ x: MARGIN, y: ty, text: line, anchor: 'start', role: 'caption', size: CAPTION_SIZE });
      ty += CAPTION_LINE;
    }
    let py = ty - CAPTION_SIZE + 2;
    for (const p of pills) {
      markers.push({ type: p.type, x: MARGIN, y: py, w: p.w, h: p.h, text: p.text, lines: p.lines.map((l, i) => (i === 0 ? l.slice(2) : l)), levelIndex: d });
      py += p.h + 4;
    }
    y += h;
  });
  const picBottom = y - 4;

  // ---- right: nested boxes, breadth first so that the cap cuts deep levels evenly
  const plans = planLevels(totals);
  const minNeed = minNeeds(plans);
  const comfy = comfyNeeds(plans);
  interface Placed {
    box: DiagramBox;
    pos: number;
  }
  let parents: (Placed | undefined)[] = [undefined];
  for (let d = 0; d < n && parents.length > 0; d++) {
    const next: Placed[] = [];
    const top = bandTop[d]! + 4;
    const h = picBottom - d * PAD - top;
    for (const parent of parents) {
      const x0 = parent ? parent.box.x + PAD : picX;
      const w0 = parent ? parent.box.w - 2 * PAD : picW;
      const { slots, more } = childSlots(x0, w0, d, plans, minNeed, comfy, d === aIndex && nArms > 1);
      if (slots.length === 0 || boxes.length + slots.length > MAX_BOXES) {
        if (parent) parent.box.closed = true;
        continue;
      }
      slots.forEach((s, i) => {
        let arm: number | undefined;
        if (aIndex !== undefined && nArms > 0) {
          if (d === aIndex) arm = ((parent?.pos ?? 0) + i) % nArms;
          else if (d > aIndex) arm = parent?.box.arm;
        }
        const box: DiagramBox = { x: round(s.x), y: round(top), w: round(s.w), h: round(h), levelIndex: d, kind: totals[d]!.level.kind };
        if (arm !== undefined) box.arm = arm;
        if (d === aIndex) box.assigned = true;
        boxes.push(box);
        next.push({ box, pos: i });
      });
      if (more) {
        markers.push({ type: 'more', x: round(more.x), y: round(top), w: more.w, h: round(h), text: '…', lines: ['…'], levelIndex: d });
      }
    }
    parents = next;
  }

  // arm names inside the assignment-level boxes, when they fit
  if (aIndex !== undefined && nArms > 0) {
    for (const b of boxes) {
      if (b.levelIndex !== aIndex || b.arm === undefined) continue;
      const full = arms!.names[b.arm]!;
      const letter = armLetter(b.arm);
      const text = estWidth(full, CAPTION_SIZE, true) + 10 <= b.w ? full : estWidth(letter, CAPTION_SIZE, true) + 6 <= b.w ? letter : undefined;
      if (!text) continue;
      labels.push({ x: round(b.x + b.w / 2), y: round(b.y + 21), text, anchor: 'middle', weight: 'bold', role: 'arm', size: CAPTION_SIZE, background: true });
    }
  }

  // ---- legend, totals, message
  y += 8;
  if (arms && nArms > 0) {
    let x = MARGIN;
    const rowH = 22;
    let rowY = y;
    arms.names.forEach((name, i) => {
      const text = `${armLetter(i)} · ${name}`;
      const itemW = 22 + estWidth(text, CAPTION_SIZE) + 16;
      if (x > MARGIN && x + itemW > width - MARGIN) {
        x = MARGIN;
        rowY += rowH;
      }
      swatches.push({ x, y: rowY, w: 16, h: 14, arm: i });
      labels.push({ x: x + 22, y: rowY + 11, text, anchor: 'start', role: 'legend', size: CAPTION_SIZE });
      x += itemW;
    });
    y = rowY + rowH + 4;
  }

  const observations = f.totalObs;
  const measuredName = measured.level.name;
  let totalsText: string;
  let message: string | undefined;
  if (!assigned) {
    totalsText = `${formatCount(observations)} ${obsWord(observations)} · the level of assignment is not chosen yet`;
    message = 'Choose the level where the treatment is assigned (Assignment step) to see the arms and the independent units.';
  } else {
    const k = assigned.total;
    const perArm = arms ? ` (${arms.text})` : '';
    if (assigned.level.kind === 'repeated' || assigned.level.kind === 'replicate') {
      const owner = f.withinUnit ? f.eu : undefined;
      totalsText = `${formatCount(observations)} ${obsWord(observations)} · ${counted(k, assigned.level.name)} at the level of assignment${perArm}`;
      if (owner) totalsText += `, not independent: they come from ${counted(owner.total, owner.level.name)}`;
    } else {
      totalsText = `${formatCount(observations)} ${obsWord(observations)} · ${formatCount(k)} independent ${unitName('unit', k)} at the level of assignment${perArm}`;
    }
    if (!arms && !continuous) message = 'Add the arms (Assignment step) to see how the units are split between them.';
  }

  wrapText(totalsText, width - 2 * MARGIN, BAND_SIZE, true).forEach((line) => {
    labels.push({ x: MARGIN, y: y + BAND_SIZE, text: line, anchor: 'start', weight: 'bold', role: 'totals', size: BAND_SIZE });
    y += BAND_LINE;
  });
  if (message) {
    y += 4;
    wrapText(message, width - 2 * MARGIN, CAPTION_SIZE).forEach((line) => {
      labels.push({ x: MARGIN, y: y + CAPTION_SIZE, text: line, anchor: 'start', role: 'message', size: CAPTION_SIZE });
      y += CAPTION_LINE;
    });
  }
  const height = Math.round(y + MARGIN);

  // ---- description for screen readers
  const description: string[] = [];
  const names = totals.map((t) => unitName(t.level.name, 2));
  description.push(
    n === 1
      ? `The study has one level: ${names[0]}.`
      : `The study has ${n} levels, from the top: ${listJoin(names)}.`,
  );
  totals.forEach((t) => {
    const parts: string[] = [];
    const name = t.level.name;
    if (t.index === 0) parts.push(`Level 1: ${counted(t.total, name)} in the study`);
    else
      parts.push(
        `Level ${t.index + 1}: ${formatCount(t.perParent)} ${unitName(name, t.perParent)} per ${unitName(totals[t.index - 1]!.level.name, 1)}, ${formatCount(t.total)} in all`,
      );
    let s = parts[0]!;
    if (t.index === aIndex && arms) s += `, ${arms.text} (${listJoin(arms.names)})`;
    s += `. ${capitalise(unitName(name, 2))} are ${KIND_SENTENCE[t.level.kind]}.`;
    if (t.index === aIndex) {
      s += continuous
        ? ' The exposure varies at this level.'
        : arms
          ? ` The treatment is assigned here: each ${unitName(name, 1)} receives one arm.`
          : ' The treatment is assigned here.';
    }
    if (t.index === measured.index) s += ' The outcome is measured here.';
    description.push(s);
  });
  description.push(`In total: ${totalsText.replace(' · ', ', ')}.`);
  if (message) description.push(message);
  if (plans.some((p) => p.count > p.drawn)) {
    description.push(`The picture draws at most ${DRAWN_PER_PARENT} units per parent; “…” stands for the rest.`);
  }
  void measuredName;

  return { width, height, boxes, labels, markers, swatches, bands, arms: arms?.names ?? [], totals: totalsText, description, empty: false };
}

function obsWord(n: number): string {
  return unitName('observation', n);
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}
