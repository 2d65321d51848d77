declare module '#app' {
  interface PageMeta {
    /** the page takes the full width of the window (the Bench) */
    wide?: boolean
  }
}
export {}
