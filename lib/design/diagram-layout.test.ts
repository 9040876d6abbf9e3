import { describe, expect, it } from 'vitest';
import { CLASSROOM_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { designSchema, type Design, type DesignInput } from './schema';
import { layoutDiagram, MAX_BOXES, type DiagramLayout } from './diagram-layout';

const KINDS = ['grouping', 'independent', 'repeated', 'replicate', 'independent'] as const;
const NAMES = ['Site', 'Classroom', 'Pupil', 'Visit', 'Sample'];

function build(counts: number[], assignAt: number | null = 0, arms = 2): Design {
  const input: DesignInput = {
    structure: {
      levels: counts.map((count, i) => ({ id: `l${i}`, name: NAMES[i % NAMES.length] + (i >= NAMES.length ? ` ${i}` : ''), kind: KINDS[i % KINDS.length]!, count })),
    },
    assignment: {
      kind: 'randomised',
      levelId: assignAt === null ? undefined : `l${assignAt}`,
      arms: Array.from({ length: arms }, (_, i) => ({ name: `Arm ${i + 1}`, allocation: 1 })),
    },
  };
  return designSchema.parse(input);
}

function checkGeometry(l: DiagramLayout) {
  expect(l.boxes.length).toBeLessThanOrEqual(MAX_BOXES);
  for (const b of l.boxes) {
    expect(b.x).toBeGreaterThanOrEqual(0);
    expect(b.y).toBeGreaterThanOrEqual(0);
    expect(b.w).toBeGreaterThan(0);
    expect(b.h).toBeGreaterThan(0);
    expect(b.x + b.w).toBeLessThanOrEqual(l.width + 1e-6);
    expect(b.y + b.h).toBeLessThanOrEqual(l.height + 1e-6);
  }
  for (const m of l.markers) {
    expect(m.x).toBeGreaterThanOrEqual(0);
    expect(m.x + m.w).toBeLessThanOrEqual(l.width + 1e-6);
  }
  for (const t of l.labels) {
    expect(t.size).toBeGreaterThanOrEqual(12);
    expect(t.x).toBeGreaterThanOrEqual(0);
    expect(t.x).toBeLessThanOrEqual(l.width);
    expect(t.y).toBeLessThanOrEqual(l.height);
  }
  // boxes of one band do not overlap
  const byLevel = new Map<number, typeof l.boxes>();
  for (const b of l.boxes) byLevel.set(b.levelIndex, [...(byLevel.get(b.levelIndex) ?? []), b]);
  for (const list of byLevel.values()) {
    for (let i = 0; i < list.length; i++)
      for (let j = i + 1; j < list.length; j++) {
        const a = list[i]!;
        const b = list[j]!;
        const overlapX = a.x < b.x + b.w - 1e-6 && b.x < a.x + a.w - 1e-6;
        const overlapY = a.y < b.y + b.h - 1e-6 && b.y < a.y + a.h - 1e-6;
        expect(overlapX && overlapY, `boxes ${i} and ${j} of level ${a.levelIndex} overlap`).toBe(false);
      }
  }
  // children lie inside their band's parents
  for (const b of l.boxes) {
    if (b.levelIndex === 0) continue;
    const parent = l.boxes.find(
      (p) => p.levelIndex === b.levelIndex - 1 && p.x <= b.x && p.x + p.w >= b.x + b.w && p.y <= b.y && p.y + p.h >= b.y + b.h,
    );
    expect(parent, 'child box inside a parent').toBeDefined();
  }
}

const bandTexts = (l: DiagramLayout) => l.labels.filter((x) => x.role === 'band').map((x) => x.text).join(' ');

describe('layoutDiagram: demo designs', () => {
  it('classroom: 20 classrooms (10 per arm), 25 pupils per classroom', () => {
    const l = layoutDiagram(designSchema.parse(CLASSROOM_DESIGN));
    checkGeometry(l);
    expect(bandTexts(l)).toContain('20 classrooms (10 per arm)');
    expect(bandTexts(l)).toContain('25 pupils per classroom');
    expect(l.totals).toBe('500 observations · 20 independent units at the level of assignment (10 per arm)');
    expect(l.markers.map((m) => m.type)).toEqual(expect.arrayContaining(['assigned', 'measured', 'more']));
    const assigned = l.boxes.filter((b) => b.assigned);
    expect(assigned.map((b) => b.arm)).toEqual([0, 1, 0]);
    expect(l.labels.filter((x) => x.role === 'arm').map((x) => x.text)).toContain('Programme');
    expect(l.labels.filter((x) => x.role === 'legend').map((x) => x.text)).toEqual(['A · Programme', 'B · Usual teaching']);
    expect(l.boxes.filter((b) => b.levelIndex === 0).every((b) => b.kind === 'grouping')).toBe(true);
    expect(l.description.join(' ')).toContain('The treatment is assigned here');
    expect(l.description.join(' ')).toContain('The outcome is measured here');
  });

  it('greenhouse: three levels with replicates', () => {
    const l = layoutDiagram(designSchema.parse(GREENHOUSE_DESIGN));
    checkGeometry(l);
    expect(bandTexts(l)).toContain('12 trays (6 per arm)');
    expect(bandTexts(l)).toContain('6 plants per tray');
    expect(bandTexts(l)).toContain('4 leaves per plant');
    expect(l.totals).toContain('288 observations · 12 independent units');
    expect(l.boxes.some((b) => b.kind === 'replicate')).toBe(true);
  });

  it('sleep: assignment at the repeated level says the nights are not independent', () => {
    const l = layoutDiagram(designSchema.parse(SLEEP_DESIGN));
    checkGeometry(l);
    expect(bandTexts(l)).toContain('24 volunteers');
    expect(bandTexts(l)).toContain('8 nights per volunteer');
    expect(l.totals).toContain('192 observations · 192 nights at the level of assignment (96 per arm)');
    expect(l.totals).toContain('24 volunteers');
    const nights = l.boxes.filter((b) => b.levelIndex === 1 && b.assigned);
    expect(new Set(nights.map((b) => b.arm))).toEqual(new Set([0, 1]));
  });
});

describe('layoutDiagram: shapes and sizes', () => {
  for (let levels = 1; levels <= 5; levels++) {
    for (const count of [1, 7, 5000]) {
      it(`${levels} level(s) of ${count}`, () => {
        const counts = new Array(levels).fill(count);
        for (const width of [320, 640, 960]) {
          const l = layoutDiagram(build(counts, 0), { width });
          expect(l.width).toBe(width);
          checkGeometry(l);
          expect(l.boxes.filter((b) => b.levelIndex === 0).length).toBeGreaterThan(0);
          expect(l.labels.filter((x) => x.role === 'band').length).toBeGreaterThanOrEqual(levels);
          if (count === 5000) {
            expect(bandTexts(l)).toContain('5,000');
            expect(l.markers.some((m) => m.type === 'more')).toBe(true);
          }
          if (count === 1) expect(l.markers.some((m) => m.type === 'more')).toBe(false);
        }
      });
    }
  }

  it('8 levels of 1,000,000 stay bounded and readable', () => {
    const l = layoutDiagram(build(new Array(8).fill(1_000_000), 3, 10));
    checkGeometry(l);
    expect(l.boxes.length).toBeLessThanOrEqual(200);
    expect(bandTexts(l)).toContain('1,000,000');
    expect(l.labels.filter((x) => x.role === 'legend')).toHaveLength(10);
  });

  it('deep and narrow: the assignment level still shows more than one arm', () => {
    for (const width of [320, 360, 640]) {
      const l = layoutDiagram(build([5000, 7, 5000, 7, 3], 1, 3), { width });
      checkGeometry(l);
      expect(new Set(l.boxes.filter((b) => b.assigned).map((b) => b.arm)).size).toBeGreaterThan(1);
    }
  });

  it('singular and irregular words', () => {
    const l = layoutDiagram(build([1, 1], null));
    expect(l.totals).toMatch(/^1 observation · /);
    expect(bandTexts(l)).toContain('1 site');
  });

  it('unequal allocation lists units per arm', () => {
    const d = designSchema.parse({
      structure: { levels: [{ id: 'c', name: 'Clinic', kind: 'grouping', count: 30 }] },
      assignment: { kind: 'randomised', levelId: 'c', arms: [{ name: 'New', allocation: 2 }, { name: 'Old', allocation: 1 }] },
    });
    const l = layoutDiagram(d);
    expect(bandTexts(l)).toContain('30 clinics (20 New, 10 Old)');
    expect(l.totals).toContain('(20 New, 10 Old)');
  });

  it('deterministic', () => {
    const d = designSchema.parse(GREENHOUSE_DESIGN);
    expect(layoutDiagram(d)).toEqual(layoutDiagram(d));
    expect(JSON.stringify(layoutDiagram(build([5000, 7, 3], 1)))).toBe(JSON.stringify(layoutDiagram(build([5000, 7, 3], 1))));
  });
});

describe('layoutDiagram: incomplete designs', () => {
  it('empty design gives a friendly message', () => {
    const l = layoutDiagram(designSchema.parse({}));
    expect(l.empty).toBe(true);
    expect(l.boxes).toHaveLength(0);
    expect(l.labels.some((x) => x.role === 'message')).toBe(true);
    expect(l.description.join(' ')).toMatch(/no levels/i);
    expect(l.height).toBeGreaterThan(0);
  });

  it('no assignment: draws the levels and asks for the level of assignment', () => {
    const l = layoutDiagram(build([20, 25], null));
    checkGeometry(l);
    expect(l.boxes.every((b) => b.arm === undefined)).toBe(true);
    expect(l.markers.some((m) => m.type === 'assigned')).toBe(false);
    expect(l.markers.some((m) => m.type === 'measured')).toBe(true);
    expect(l.totals).toContain('500 observations');
    expect(l.labels.filter((x) => x.role === 'message').map((x) => x.text).join(' ')).toMatch(/Choose the level/);
  });

  it('assignment level without arms', () => {
    const l = layoutDiagram(build([20, 25], 0, 0));
    checkGeometry(l);
    expect(l.totals).toBe('500 observations · 20 independent units at the level of assignment');
    expect(l.labels.some((x) => x.role === 'message')).toBe(true);
  });
});
