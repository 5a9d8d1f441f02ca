import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEMO_BUDGET, JsonInputError, budgetSchema, parseBudgetText } from '../../../shared/schemas/budget';
import { EXAMPLE_BUDGET } from '../../factories/budget';

const fixturePath = new URL('../../fixtures/budget-demo.json', import.meta.url);
const demoText = readFileSync(fixturePath, 'utf8');

function problemsOf(text: string): JsonInputError['problems'] {
  try {
    parseBudgetText(text, 'u.json');
  } catch (e) {
    if (e instanceof JsonInputError) return e.problems;
    throw e;
  }
  throw new Error('expected the budget to be rejected');
}

describe('budget schema (docs/motion-conventions.md section 7 format)', () => {
  it('accepts the demo fixture, which matches the built-in demo budget', () => {
    expect(parseBudgetText(demoText, 'budget-demo.json')).toEqual(DEMO_BUDGET);
  });

  it('accepts the example budget printed in docs/motion-conventions.md section 7', () => {
    const specExample = structuredClone(EXAMPLE_BUDGET);
    expect(budgetSchema.safeParse(specExample).success).toBe(true);
  });

  it('names the row, line and column when lower >= upper', () => {
    const text = demoText.replace(/\[1\.0,\s*-0\.5,\s*0\.5\]/, '[1.0, 0.5, -0.5]');
    const [p, ...rest] = problemsOf(text);
    expect(rest).toHaveLength(0);
    expect(p?.path).toBe('envelope.x[1]');
    expect(p?.reason).toMatch(/lower_g .* less than upper_g/);
    // Where the bad row's "[" sits, counted by hand from the text.
    const lines = text.split('\n');
    const lineIndex = lines.findIndex((l) => l.includes('[1.0, 0.5, -0.5]'));
    expect(p?.line).toBe(lineIndex + 1);
    expect(p?.column).toBe((lines[lineIndex] as string).indexOf('[1.0, 0.5, -0.5]') + 1);
  });

  it('rejects a negative duration and rows out of order, naming each', () => {
    const budget = JSON.parse(demoText) as { envelope: { y: number[][] } };
    budget.envelope.y = [
      [-1, -0.8, 0.8],
      [2, -0.4, 0.4],
      [1, -0.6, 0.6],
    ];
    const text = JSON.stringify(budget, null, 2);
    const problems = problemsOf(text);
    const paths = problems.map((p) => `${p.path}: ${p.reason}`);
    expect(paths).toContainEqual(
      expect.stringMatching(/^envelope\.y\[0\]\[0\]: duration_s must not be negative/),
    );
    expect(paths).toContainEqual(expect.stringMatching(/^envelope\.y\[2\]\[0\]: rows must be sorted/));
    const lines = text.split('\n');
    expect(problems.map((p) => lines[(p.line as number) - 1]?.trim())).toEqual(['-1,', '1,']);
  });

  it('rejects a band that does not hold the rider at rest (z at rest = +1 g)', () => {
    const text = demoText.replace('[0, 0.2, 1.8]', '[0, 1.2, 1.8]');
    const [p] = problemsOf(text);
    expect(p?.path).toBe('envelope.z[0]');
    expect(p?.reason).toMatch(/at-rest value 1 g/);
  });

  it('names a missing comfort limit, a misspelt key, a zero limit and a bad row together', () => {
    const text = demoText
      .replace('"jerkMax_mps3": 25,', '')
      .replace('"wrmsMax_mps2": 0.8', '"wrmsMax_mps2": 0, "wrmsMax": 1')
      .replace(/\[0,\s*0\.2,\s*1\.8\]/, '[0, 1.8, 0.2]');
    const problems = problemsOf(text);
    const text2 = problems.map((p) => `${p.path}: ${p.reason}`).join('\n');
    expect(text2).toMatch(/comfort\.jerkMax_mps3: jerkMax_mps3 is missing/);
    expect(text2).toMatch(/comfort\.wrmsMax_mps2: wrmsMax_mps2 must be greater than 0/);
    expect(text2).toMatch(/wrmsMax/);
    // A broken envelope row is reported in the same pass as the comfort problems.
    expect(text2).toMatch(/envelope\.z\[0\]: lower_g \(1\.8\) must be less than upper_g \(0\.2\)/);
  });

  it('reports a JSON syntax error with its line and column', () => {
    const text = demoText.replace('"strokeMargin_m": 0.02,', '"strokeMargin_m": 0.02');
    const [p] = problemsOf(text);
    expect(p?.reason).toMatch(/not valid JSON: expected ',' or '}'/);
    // The parser notices the missing comma where the next key starts.
    const lines = text.split('\n');
    const next = lines.findIndex((l) => l.includes('"envelope"'));
    expect(p?.line).toBe(next + 1);
    expect(p?.column).toBe((lines[next] as string).indexOf('"envelope"') + 1);
  });

  it('formats every problem as file:line:column: path: reason', () => {
    const text = demoText.replace('"strokeMargin_m": 0.02', '"strokeMargin_m": -0.02');
    expect(() => parseBudgetText(text, 'u.json')).toThrow(
      /^u\.json:5:21: strokeMargin_m: strokeMargin_m must not be negative$/,
    );
  });
});
