import { vg1Range, vg1Steps } from './vg1-steps';

describe('vg1Steps', () => {
  it('steps from start towards a more negative stop, both ends included', () => {
    expect(vg1Steps(0, -2, 0.5, 40)).toEqual([0, -0.5, -1, -1.5, -2]);
  });

  it('steps upwards when stop is above start', () => {
    expect(vg1Steps(-3, 0, 1, 40)).toEqual([-3, -2, -1, 0]);
  });

  it('leaves out a stop that does not fall on a step', () => {
    expect(vg1Steps(0, -1.2, 0.5, 40)).toEqual([0, -0.5, -1]);
  });

  it('is empty for a step that is not positive or a missing number', () => {
    expect(vg1Steps(0, -2, 0, 40)).toEqual([]);
    expect(vg1Steps(0, -2, -1, 40)).toEqual([]);
    expect(vg1Steps(null, -2, 1, 40)).toEqual([]);
  });

  it('stops one past the maximum count, so "too many" is visible without a huge list', () => {
    expect(vg1Steps(0, -100, 0.01, 40)).toHaveLength(41);
  });

  it('round-trips an evenly spaced list through vg1Range', () => {
    const list = [0, -1.5, -3, -4.5];
    const { startVolts, stopVolts, stepVolts } = vg1Range(list);
    expect(vg1Steps(startVolts, stopVolts, stepVolts, 40)).toEqual(list);
  });
});
