/**
 * The design diagram as an accessible SVG: draws `layoutDiagram` (lib/design/diagram-layout.ts).
 * Server-safe (no hooks, no browser APIs). The SVG scales to its container through its viewBox;
 * `<title>` and `<desc>` carry the totals and the level-by-level description for screen readers.
 * `DiagramExport` finds the SVG by `id` to download it.
 */
import type { Design } from '@/lib/design/schema';
import { layoutDiagram, type DiagramBox, type DiagramLayout, type LevelKind } from '@/lib/design/diagram-layout';

export interface DesignDiagramProps {
  design: Design;
  /** Layout width in px (the viewBox width); the SVG itself fills its container. */
  width?: number;
  title?: string;
  id?: string;
}

/** Ink and fills chosen for AA contrast on white: text #1f2937 (≈15:1), captions #374151 (≈10:1). */
const INK = '#1f2937';
const INK_SOFT = '#374151';
const OUTLINE = '#334155';
const RULE = '#d5dbe3';
const NEUTRAL_FILLS = ['#f4f6f8', '#ffffff'];

/** Arm fills (pale) with a darker pattern ink of the same hue; arms differ by colour and by pattern. */
export const ARM_STYLES = [
  { fill: '#d6e6f2', ink: '#3b6e94', pattern: 'none' },
  { fill: '#f5e2c4', ink: '#9a6a22', pattern: 'stripes' },
  { fill: '#d7ecd9', ink: '#3f7a4b', pattern: 'dots' },
  { fill: '#e6dcef', ink: '#6b4f86', pattern: 'cross' },
  { fill: '#f3d9dc', ink: '#94505a', pattern: 'hlines' },
  { fill: '#e6e2d3', ink: '#6e6548', pattern: 'vlines' },
] as const;

const MARKER_FILL = { assigned: '#0f5560', measured: '#5a3a70' } as const;

function outline(kind: LevelKind): { strokeWidth: number; dash?: string; cap?: 'round' } {
  switch (kind) {
    case 'grouping':
      return { strokeWidth: 3 };
    case 'repeated':
      return { strokeWidth: 1.5, dash: '6 4' };
    case 'replicate':
      return { strokeWidth: 2, dash: '0.5 4', cap: 'round' };
    default:
      return { strokeWidth: 1.5 };
  }
}

function armStyle(arm: number) {
  return ARM_STYLES[arm % ARM_STYLES.length]!;
}

function Patterns({ prefix, arms }: { prefix: string; arms: number }) {
  const defs = [];
  for (let i = 0; i < Math.min(arms, ARM_STYLES.length); i++) {
    const s = ARM_STYLES[i]!;
    const id = `${prefix}-arm-${i}`;
    if (s.pattern === 'none') continue;
    defs.push(
      <pattern key={id} id={id} width={8} height={8} patternUnits="userSpaceOnUse" patternTransform={s.pattern === 'stripes' ? 'rotate(45)' : undefined}>
        {s.pattern === 'stripes' && <line x1={0} y1={0} x2={0} y2={8} stroke={s.ink} strokeWidth={2} strokeOpacity={0.45} />}
        {s.pattern === 'dots' && <circle cx={4} cy={4} r={1.4} fill={s.ink} fillOpacity={0.55} />}
        {s.pattern === 'cross' && (
          <path d="M0 0 L8 8 M8 0 L0 8" stroke={s.ink} strokeWidth={1} strokeOpacity={0.45} />
        )}
        {s.pattern === 'hlines' && <line x1={0} y1={4} x2={8} y2={4} stroke={s.ink} strokeWidth={1.5} strokeOpacity={0.45} />}
        {s.pattern === 'vlines' && <line x1={4} y1={0} x2={4} y2={8} stroke={s.ink} strokeWidth={1.5} strokeOpacity={0.45} />}
      </pattern>,
    );
  }
  return <>{defs}</>;
}

function armPatternFill(prefix: string, arm: number): string | undefined {
  const s = armStyle(arm);
  if (s.pattern === 'none' || arm >= ARM_STYLES.length) return undefined;
  return `url(#${prefix}-arm-${arm})`;
}

function BoxShape({ box, prefix }: { box: DiagramBox; prefix: string }) {
  const o = outline(box.kind);
  const inset = o.strokeWidth / 2;
  const x = box.x + inset;
  const y = box.y + inset;
  const w = Math.max(1, box.w - 2 * inset);
  const h = Math.max(1, box.h - 2 * inset);
  // Units of the assignment level carry the arm's fill and pattern; units below are transparent
  // so the arm shows through; units above are neutral.
  const fill = box.assigned && box.arm !== undefined ? armStyle(box.arm).fill : box.arm !== undefined ? 'none' : NEUTRAL_FILLS[box.levelIndex % 2]!;
  const pattern = box.assigned && box.arm !== undefined ? armPatternFill(prefix, box.arm) : undefined;
  return (
    <g>
      <rect x={x} y={y} width={w} height={h} rx={3} fill={fill} />
      {pattern && <rect x={x} y={y} width={w} height={h} rx={3} fill={pattern} />}
      <rect
        x={x}
        y={y}
        width={w}
        height={h}
        rx={3}
        fill="none"
        stroke={OUTLINE}
        strokeWidth={o.strokeWidth}
        strokeDasharray={o.dash}
        strokeLinecap={o.cap}
      />
    </g>
  );
}

export function DiagramSvg({ layout, id, title }: { layout: DiagramLayout; id: string; title: string }) {
  const titleId = `${id}-title`;
  const descId = `${id}-desc`;
  const prefix = id.replace(/[^A-Za-z0-9_-]/g, '') || 'diagram';
  return (
    <svg
      id={id}
      role="img"
      aria-labelledby={`${titleId} ${descId}`}
      viewBox={`0 0 ${layout.width} ${layout.height}`}
      width={layout.width}
      height={layout.height}
      preserveAspectRatio="xMinYMin meet"
      style={{ width: '100%', height: 'auto', maxWidth: layout.width * 1.5, fontFamily: 'system-ui, -apple-system, "Segoe UI", Roboto, sans-serif' }}
      xmlns="http://www.w3.org/2000/svg"
    >
      <title id={titleId}>{`${title}. ${layout.totals}`}</title>
      <desc id={descId}>{layout.description.join(' ')}</desc>
      <defs>
        <Patterns prefix={prefix} arms={layout.arms.length} />
      </defs>
      <rect x={0} y={0} width={layout.width} height={layout.height} fill="#ffffff" />

      {layout.bands.map((b) =>
        b.levelIndex > 0 ? <line key={`band-${b.levelIndex}`} x1={12} x2={layout.width - 12} y1={b.y} y2={b.y} stroke={RULE} strokeWidth={1} /> : null,
      )}

      <g aria-hidden="true">
        {layout.boxes.map((box, i) => (
          <BoxShape key={`box-${i}`} box={box} prefix={prefix} />
        ))}

        {layout.markers.map((m, i) =>
          m.type === 'more' ? (
            <text key={`m-${i}`} x={m.x + m.w / 2} y={m.y + Math.min(m.h / 2, 30) + 5} textAnchor="middle" fontSize={16} fontWeight={700} fill={INK}>
              …
            </text>
          ) : (
            <g key={`m-${i}`}>
              <rect x={m.x} y={m.y} width={m.w} height={m.h} rx={m.h / 2} fill={MARKER_FILL[m.type]} />
              <text x={m.x + 10} y={m.y + 14} fontSize={12} fontWeight={600} fill="#ffffff">
                {m.lines.map((line, j) => (
                  <tspan key={j} x={m.x + 10} dy={j === 0 ? 0 : 14}>
                    {j === 0 ? (m.type === 'assigned' ? '▸ ' : '● ') : ''}
                    {line}
                  </tspan>
                ))}
              </text>
            </g>
          ),
        )}

        {layout.swatches.map((s, i) => {
          const pattern = armPatternFill(prefix, s.arm);
          return (
            <g key={`sw-${i}`}>
              <rect x={s.x} y={s.y} width={s.w} height={s.h} rx={2} fill={armStyle(s.arm).fill} />
              {pattern && <rect x={s.x} y={s.y} width={s.w} height={s.h} rx={2} fill={pattern} />}
              <rect x={s.x + 0.5} y={s.y + 0.5} width={s.w - 1} height={s.h - 1} rx={2} fill="none" stroke={OUTLINE} strokeWidth={1} />
            </g>
          );
        })}

        {layout.labels.map((l, i) => {
          const w = l.text.length * l.size * 0.62 + 8;
          const x0 = l.anchor === 'middle' ? l.x - w / 2 : l.anchor === 'end' ? l.x - w : l.x - 4;
          return (
            <g key={`l-${i}`}>
              {l.background && <rect x={x0} y={l.y - l.size} width={w} height={l.size + 5} rx={3} fill="#ffffff" fillOpacity={0.92} />}
              <text
                x={l.x}
                y={l.y}
                textAnchor={l.anchor}
                fontSize={l.size}
                fontWeight={l.weight === 'bold' ? 650 : 400}
                fill={l.role === 'caption' || l.role === 'message' ? INK_SOFT : INK}
              >
                {l.text}
              </text>
            </g>
          );
        })}
      </g>
    </svg>
  );
}

export function DesignDiagram({ design, width = 640, title = 'Study design diagram', id = 'design-diagram' }: DesignDiagramProps) {
  const layout = layoutDiagram(design, { width });
  return <DiagramSvg layout={layout} id={id} title={title} />;
}

export default DesignDiagram;
