// JSON inputs (bases, budgets, profiles) are read by one scanner; hostile text is bad input with a
// place, never a crash. Positions follow RFC 8259's grammar, counted by hand here.
import { describe, expect, it } from 'vitest';
import { budgetSchema } from '../../../shared/schemas/budget';
import { JsonInputError, parseJsonWith, scanJson } from '../../../shared/schemas/json-input';

describe('JSON input', () => {
  it('reports nesting too deep for the stack as bad input at line 1, column 1', () => {
    const deep = '['.repeat(200_000) + ']'.repeat(200_000);
    let err: unknown;
    try {
      parseJsonWith(budgetSchema, deep, 'deep.json');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(JsonInputError);
    expect((err as Error).message).toMatch(/^deep\.json:1:1: .*nested too deeply/);
  });

  it('names the line and column of a syntax error', () => {
    // Line 3, column 13 is the stray brace after the colon (two spaces, nine characters of key, the colon).
    const text = '{\n  "strokeMargin_m": 0.02,\n  "comfort":}\n';
    const scan = scanJson(text);
    expect(scan.ok).toBe(false);
    expect(() => parseJsonWith(budgetSchema, text, 'b.json')).toThrow(/^b\.json:3:13: /);
  });
});
