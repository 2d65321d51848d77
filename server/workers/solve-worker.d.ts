/** The built engine worker's address (a file: URL), from the Rollup plugin in server/workers/build.ts. */
declare module '#solve-worker' {
  const workerUrl: () => string
  export default workerUrl
}
