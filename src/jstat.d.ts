// jstat ships CommonJS without types; we declare the slice we use.
declare module 'jstat' {
  const jStat: any; // eslint-disable-line @typescript-eslint/no-explicit-any
  export default jStat;
}
