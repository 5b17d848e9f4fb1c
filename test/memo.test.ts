import { describe, it, expect } from 'vitest';
import { remembered } from '../src/memo.js';

describe('remembered (first-in-first-out memo)', () => {
  it('computes once per key, and forgets the oldest key beyond its size (common practice, no source)', () => {
    const memo = new Map<string, number>();
    let calls = 0;
    const square = (k: number): number => remembered(memo, 2, String(k), () => (calls++, k * k));
    expect(square(3)).toBe(9);
    expect(square(3)).toBe(9);
    expect(calls).toBe(1);
    square(4);
    square(5); // evicts 3
    expect([...memo.keys()]).toEqual(['4', '5']);
    expect(square(3)).toBe(9);
    expect(calls).toBe(4);
  });
});
