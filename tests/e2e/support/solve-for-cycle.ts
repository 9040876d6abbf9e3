import { expect, type Locator } from '@playwright/test';

/** The typed inputs of a form by their name (radios and checkboxes aside). */
async function inputValues(form: Locator): Promise<Record<string, string>> {
  return form.locator('input[name]:not([type=radio]):not([type=checkbox])').evaluateAll((els) => Object.fromEntries(els.map((el) => [(el as HTMLInputElement).name, (el as HTMLInputElement).value])));
}

/**
 * Clicks through every change of the "Solve for" choice (each ordered pair of options, so every
 * cycle back and forth) and asserts that no input the user had already seen with a value is
 * rewritten: a quantity that was solved for comes back with what was in its field before (a
 * field that had never been filled may start from the answer, and keeps that value after).
 * Returns the values seen, by input name.
 */
export async function expectSolveForKeepsInputs(form: Locator): Promise<Record<string, string>> {
  const group = form.getByRole('group', { name: 'Solve for' });
  const options = await group.getByRole('radio').evaluateAll((els) => els.map((el) => (el as HTMLInputElement).value));
  expect(options.length).toBeGreaterThan(1);
  const seen: Record<string, string> = {};
  const visit = async (option: string, step: string) => {
    await group.locator(`input[type=radio][value="${option}"]`).check();
    const now = await inputValues(form);
    for (const [name, value] of Object.entries(now)) {
      if (name in seen && seen[name] !== '') expect(value, `${name} after ${step}`).toBe(seen[name]);
      else seen[name] = value;
    }
  };
  let current = options[0]!;
  await visit(current, `start at ${current}`);
  for (const from of options) {
    for (const to of options) {
      if (from === to) continue;
      if (current !== from) await visit(from, `${current} → ${from}`);
      await visit(to, `${from} → ${to}`);
      current = to;
    }
  }
  return seen;
}
