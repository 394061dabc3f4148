package site

import "embed"

// Files holds index.html, manifest.webmanifest and sw.js. sw.js is a
// template: VersionMark and AssetsMark are replaced at build time.
//
//go:embed index.html manifest.webmanifest sw.js
var Files embed.FS

// VersionMark is the text in sw.js replaced by the cache version key (a
// content hash of every other asset).
const VersionMark = "__EVENBEAT_VERSION__"

// AssetsMark is the text in sw.js replaced by the JSON array of asset URLs
// the worker precaches.
const AssetsMark = "__EVENBEAT_ASSETS__"
