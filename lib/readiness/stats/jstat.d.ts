// Minimal typing of the parts of jstat this folder uses (jstat ships no types).
declare module "jstat" {
  interface JStatStatic {
    centralF: { inv(p: number, df1: number, df2: number): number };
    chisquare: { inv(p: number, dof: number): number };
  }
  const jStat: JStatStatic;
  export default jStat;
}
