/** Vite (and so vitest) can import a file's text with `?raw`; tests use it to read the README without Node APIs. */
declare module '*?raw' {
  const content: string;
  export default content;
}
