// The package ships no types. It takes edges [i, j, weight] and returns, for every vertex up to
// the highest index named, the index of its mate or -1.
declare module 'edmonds-blossom' {
  function maxWeightMatching(
    edges: readonly (readonly [number, number, number])[],
    maxCardinality?: boolean,
  ): number[];
  export default maxWeightMatching;
}
