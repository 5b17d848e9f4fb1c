import { describe, it, expect } from 'vitest';
import { intervalIntersection, intervalUnion } from '../../src/numeric/intervals.js';

describe('interval sets', () => {
  it('the union sorts, merges overlapping and touching intervals, and keeps disjoint ones (common practice, no source)', () => {
    expect(intervalUnion([[5, 6], [0, 2], [1, 3], [3, 4], [8, 9]])).toEqual([[0, 4], [5, 6], [8, 9]]);
    expect(intervalUnion([[0, 10], [2, 3]])).toEqual([[0, 10]]);
    expect(intervalUnion([])).toEqual([]);
  });

  it('the union leaves its input unchanged', () => {
    const iv: Array<[number, number]> = [[1, 3], [0, 2]];
    intervalUnion(iv);
    expect(iv).toEqual([[1, 3], [0, 2]]);
  });

  it('the intersection of two sorted disjoint lists keeps only the common parts, without empty pieces (common practice, no source)', () => {
    expect(intervalIntersection([[0, 4], [6, 10]], [[2, 7], [9, 12]])).toEqual([[2, 4], [6, 7], [9, 10]]);
    expect(intervalIntersection([[0, 1]], [[1, 2]])).toEqual([]);
    expect(intervalIntersection([], [[0, 1]])).toEqual([]);
  });
});
