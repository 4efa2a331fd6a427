import { describe, expect, it } from 'vitest';
import { canonicalText, NotCanonicalisable } from './canonical-json.js';

function nested(levels: number): Record<string, unknown> {
  const root: Record<string, unknown> = {};
  let at = root;
  for (let i = 0; i < levels; i++) {
    const next: Record<string, unknown> = {};
    at.a = next;
    at = next;
  }
  return root;
}

const failure = (value: unknown): NotCanonicalisable => {
  try {
    canonicalText(value);
  } catch (err) {
    if (err instanceof NotCanonicalisable) return err;
    throw err;
  }
  throw new Error('canonicalised');
};

describe('canonical text', () => {
  it('serialises by RFC 8785: keys sorted, no spaces', () => {
    expect(canonicalText({ b: 1, a: ['x', 2.5] })).toBe('{"a":["x",2.5],"b":1}');
  });

  it('names the field holding a lone surrogate, in a value or in a key', () => {
    expect(failure({ code: { patient: { name: 'half \ud800' } } })).toMatchObject({ path: 'code.patient.name', why: expect.stringMatching(/lone surrogate/) as unknown });
    expect(failure({ entries: [{ changes: { ['\udc00']: 1 } }] })).toMatchObject({ path: 'entries.0.changes', why: expect.stringMatching(/field name/) as unknown });
  });

  it('says a value is nested too deep instead of overflowing the stack', () => {
    const err = failure({ entries: [{ changes: nested(20_000) }] });
    expect(err.why).toMatch(/nested more than 200 levels deep/);
    expect(err.path).toBe('entries.0.changes.a.a.a.….a');
  });
});
