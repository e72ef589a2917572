/** The matching metric in words, for the app's help next to the matching results. */
export const METRIC_DESCRIPTION =
  'Emberline measures how far apart two valves are in percent. At each operating point it ' +
  'takes the difference of their anode currents (Ia) and of their mutual conductances (gm), ' +
  "each as a percentage of the two valves' mean; at an equal-current point each valve is " +
  'taken at the grid voltage that gives the stated current, so only gm counts there. If a ' +
  'window is set, it also reads both anode families on a common grid of anode and grid ' +
  'voltages and takes the root mean square of the relative Ia difference over the grid points ' +
  "where the two valves' mean current lies inside the window: this tells how well the whole " +
  'curves agree, not just one point. The distance is the weighted mean of the average Ia ' +
  'difference, the average gm difference and the curve difference, with the weights you set. ' +
  'Double triodes matched on both sections are compared section 1 with section 1 and section 2 ' +
  "with section 2; a section balance weight adds each valve's own difference between its " +
  'sections. A group scores the largest distance between any two of its members, so a set is ' +
  'only as good as its worst-matched pair, and the grouping with the lowest total score is ' +
  'sought. A group is acceptable when, at every point, the spread of Ia and of gm across its ' +
  'members (highest minus lowest, in percent of the group mean) and the largest curve ' +
  'difference are all within your tolerance. As common practice goes, 5 % is a usual target, ' +
  '2-3 % tight and 10 % loose.';
