/** Binary modules: wrangler's `Data` rule (and the test and script loaders) give an ArrayBuffer. */
declare module "*.ttf" {
  const bytes: ArrayBuffer;
  export default bytes;
}
