/**
 * What a review thread is anchored to, in one string (its key, by which markers count threads),
 * what it is called on screen, and a fingerprint of its content — so that a thread can say
 * "changed since this comment" when the anchored field, step or finding is no longer what it was.
 * Saved Plan results and stress tests never change; a thread on one says the design changed since
 * the result was computed instead (see `threadChanged`).
 */
import { DESIGN_STEPS, type Design, type DesignPart } from '@/lib/design/schema';
import { fieldValue, listFields } from '@/lib/design/fields';
import type { Finding } from '@/lib/rules/types';
import type { ThreadAnchor } from '@/lib/validation/review';

export function anchorKey(a: ThreadAnchor): string {
  switch (a.kind) {
    case 'section':
      return `section:${a.part}`;
    case 'field':
      return `field:${a.path}`;
    case 'finding':
      return `finding:${a.ruleId}:${a.key}`;
    case 'plan':
      return `plan:${a.planResultId}`;
    case 'simulation':
      return `simulation:${a.simulationId}`;
  }
}

const STEP_LABEL = Object.fromEntries(DESIGN_STEPS.map((s) => [s.part, s.label])) as Record<DesignPart, string>;

export function stepLabel(part: DesignPart): string {
  return STEP_LABEL[part];
}

/** What the design says at the anchor now, as a fingerprint; undefined when the design has no such field or finding. */
export function anchorFingerprint(a: ThreadAnchor, design: Design, findings: Finding[]): string | null | undefined {
  switch (a.kind) {
    case 'section':
      return JSON.stringify(design[a.part] ?? null);
    case 'field':
      return listFields(design).some((f) => f.path === a.path) ? JSON.stringify(fieldValue(design, a.path) ?? null) : undefined;
    case 'finding': {
      const f = findings.find((x) => x.ruleId === a.ruleId && x.key === a.key);
      return f ? JSON.stringify({ found: f.found, why: f.why, numbers: f.numbers ?? null }) : undefined;
    }
    case 'plan':
    case 'simulation':
      return null;
  }
}

/** The anchor's name on screen, in the wizard's and the Checks tab's words (null for results, named by the caller). */
export function anchorLabel(a: ThreadAnchor, design: Design, findings: Finding[]): string | undefined {
  switch (a.kind) {
    case 'section':
      return `${STEP_LABEL[a.part]} step`;
    case 'field': {
      const f = listFields(design).find((x) => x.path === a.path);
      return f ? `${STEP_LABEL[f.step]}: ${f.label}` : undefined;
    }
    case 'finding':
      return findings.find((x) => x.ruleId === a.ruleId && x.key === a.key)?.title;
    case 'plan':
    case 'simulation':
      return undefined;
  }
}

/**
 * Whether the anchored part changed since the thread started: the fingerprint differs (or the
 * field or finding is gone); for a result, the design was saved since the result was computed.
 */
export function threadChanged(
  thread: { anchor: ThreadAnchor; fingerprint: string | null; revision: number },
  now: { design: Design; findings: Finding[]; revision: number },
): boolean {
  if (thread.anchor.kind === 'plan' || thread.anchor.kind === 'simulation') return now.revision > thread.revision;
  return anchorFingerprint(thread.anchor, now.design, now.findings) !== thread.fingerprint;
}
