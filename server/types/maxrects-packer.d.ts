// The package's "main" is a UMD file inside a "type": "module" package, so Node's ESM loader sees no
// exports; its ES module build is imported by path instead, with the package's own types.
declare module 'maxrects-packer/dist/maxrects-packer.mjs' {
  export * from 'maxrects-packer'
}
