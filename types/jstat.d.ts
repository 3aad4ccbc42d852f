declare module "jstat" {
  // jstat ships no types; only the members Seedplot calls are declared.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  export const jStat: any;
  const _default: { jStat: any };
  export default _default;
}
