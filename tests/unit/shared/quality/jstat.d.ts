// Just the parts of jstat (no bundled types) that the cross-checks call.
declare module 'jstat' {
  const jStat: {
    normal: { inv(p: number, mean: number, sd: number): number }
    beta: { inv(p: number, a: number, b: number): number }
    gamma: { inv(p: number, shape: number, scale: number): number }
    ibeta(x: number, a: number, b: number): number
  }
  export default jStat
}
