#!/usr/bin/env node
// area.js reads one Gerber file with the npm packages gerber-parser 4.2.7
// and gerber-plotter 4.2.8 (the tracespace project, MIT licence; an
// independent reader of the Gerber Layer Format Specification), paints the
// plotter's image objects on a square pixel grid and prints, as JSON, the
// dark area in mm², the image's bounding box in mm, the pixel size, the
// count of each object type and the reader's warnings.
//
// usage: node area.js FILE.gbr [pixel-mm]
//
// The plotter's objects are painted as the specification defines them:
// pads (circle, rectangle, polygon primitives) at their flash points,
// strokes as the circle's sweep along each segment, fills as the area
// enclosed by each closed contour. A clear polarity, an arc in a region or
// a step-and-repeat is refused (exit 2) rather than painted wrongly; the
// files under test use none of them.
'use strict'

const fs = require('fs')
const gerberParser = require('gerber-parser')
const gerberPlotter = require('gerber-plotter')

function fail(msg) {
  process.stderr.write('area.js: ' + msg + '\n')
  process.exit(2)
}

const file = process.argv[2]
if (!file) fail('usage: node area.js FILE.gbr [pixel-mm]')
const pixelMM = process.argv[3] ? Number(process.argv[3]) : 0.005
if (!(pixelMM > 0)) fail('pixel size must be a positive number of mm')

const objects = []
const warnings = []
let size = null

const parser = gerberParser()
const plotter = gerberPlotter()
parser.on('warning', (w) => warnings.push('parser: ' + w.message))
plotter.on('warning', (w) => warnings.push('plotter: ' + w.message))
parser.on('error', (e) => fail(file + ': ' + e.message))
plotter.on('error', (e) => fail(file + ': ' + e.message))
plotter.on('data', (o) => {
  if (o.type === 'size') size = o
  else objects.push(o)
})
plotter.on('end', paint)
fs.createReadStream(file).on('error', (e) => fail(e.message)).pipe(parser).pipe(plotter)

function paint() {
  if (!size) fail(file + ': no image size from the plotter')
  const scale = size.units === 'in' ? 25.4 : 1 // to mm
  const [x0, y0, x1, y1] = size.box.map((v) => v * scale)
  const nx = Math.ceil((x1 - x0) / pixelMM)
  const ny = Math.ceil((y1 - y0) / pixelMM)
  if (!(nx > 0 && ny > 0) || nx * ny > 2e8) fail(file + ': image ' + nx + '×' + ny + ' pixels')
  const img = new Uint8Array(nx * ny)
  const tools = {}
  const counts = {}
  // pixel centre (i, j) is at (x0 + (i+0.5)p, y0 + (j+0.5)p) mm.
  const col = (x) => Math.floor((x - x0) / pixelMM - 0.5)
  const cx = (i) => x0 + (i + 0.5) * pixelMM
  const cy = (j) => y0 + (j + 0.5) * pixelMM
  function each(xa, ya, xb, yb, inside) {
    const ia = Math.max(0, col(xa)), ib = Math.min(nx - 1, col(xb) + 1)
    const ja = Math.max(0, col(ya - y0 + x0)), jb = Math.min(ny - 1, col(yb - y0 + x0) + 1)
    for (let j = ja; j <= jb; j++) {
      const y = cy(j)
      for (let i = ia; i <= ib; i++) if (inside(cx(i), y)) img[j * nx + i] = 1
    }
  }
  function polygonRows(contours) {
    // even-odd fill of each closed contour separately, OR-ed into the image
    for (const pts of contours) {
      let ya = Infinity, yb = -Infinity
      for (const p of pts) { ya = Math.min(ya, p[1]); yb = Math.max(yb, p[1]) }
      const ja = Math.max(0, col(ya - y0 + x0)), jb = Math.min(ny - 1, col(yb - y0 + x0) + 1)
      for (let j = ja; j <= jb; j++) {
        const y = cy(j)
        const xs = []
        for (let k = 0; k < pts.length; k++) {
          const a = pts[k], b = pts[(k + 1) % pts.length]
          if ((a[1] <= y) !== (b[1] <= y)) xs.push(a[0] + (y - a[1]) * (b[0] - a[0]) / (b[1] - a[1]))
        }
        xs.sort((p, q) => p - q)
        for (let k = 0; k + 1 < xs.length; k += 2) {
          const ia = Math.max(0, Math.ceil((xs[k] - x0) / pixelMM - 0.5))
          const ib = Math.min(nx - 1, Math.ceil((xs[k + 1] - x0) / pixelMM - 0.5) - 1)
          for (let i = ia; i <= ib; i++) img[j * nx + i] = 1
        }
      }
    }
  }
  function pad(shape, x, y) {
    const prims = Array.isArray(shape) ? shape : [shape]
    for (const s of prims) {
      switch (s.type) {
        case 'circle': {
          const r = s.r * scale, ox = x + s.cx * scale, oy = y + s.cy * scale
          each(ox - r, oy - r, ox + r, oy + r, (u, v) => (u - ox) ** 2 + (v - oy) ** 2 <= r * r)
          break
        }
        case 'rect': {
          const w = s.width * scale / 2, h = s.height * scale / 2, r = s.r * scale
          const ox = x + s.cx * scale, oy = y + s.cy * scale
          each(ox - w, oy - h, ox + w, oy + h, (u, v) => {
            const dx = Math.max(Math.abs(u - ox) - (w - r), 0), dy = Math.max(Math.abs(v - oy) - (h - r), 0)
            return Math.abs(u - ox) <= w && Math.abs(v - oy) <= h && dx * dx + dy * dy <= r * r
          })
          break
        }
        case 'poly':
          polygonRows([s.points.map((p) => [x + p[0] * scale, y + p[1] * scale])])
          break
        default:
          fail(file + ': pad primitive ' + s.type + ' is not painted by this check')
      }
    }
  }
  for (const o of objects) {
    counts[o.type] = (counts[o.type] || 0) + 1
    switch (o.type) {
      case 'shape':
        tools[o.tool] = o.shape
        break
      case 'pad':
        if (!tools[o.tool]) fail(file + ': pad of undefined tool ' + o.tool)
        pad(tools[o.tool], o.x * scale, o.y * scale)
        break
      case 'stroke': {
        const r = o.width * scale / 2
        for (const seg of o.path) {
          if (seg.type !== 'line') fail(file + ': stroke segment ' + seg.type + ' is not painted by this check')
          const [ax, ay] = seg.start.map((v) => v * scale), [bx, by] = seg.end.map((v) => v * scale)
          const dx = bx - ax, dy = by - ay, len2 = dx * dx + dy * dy
          each(Math.min(ax, bx) - r, Math.min(ay, by) - r, Math.max(ax, bx) + r, Math.max(ay, by) + r, (u, v) => {
            const t = len2 > 0 ? Math.max(0, Math.min(1, ((u - ax) * dx + (v - ay) * dy) / len2)) : 0
            return (u - ax - t * dx) ** 2 + (v - ay - t * dy) ** 2 <= r * r
          })
        }
        break
      }
      case 'fill': {
        // the path's segments, split into contours where a segment does not
        // start where the previous one ended
        const contours = []
        let cur = null, last = null
        for (const seg of o.path) {
          if (seg.type !== 'line') fail(file + ': region segment ' + seg.type + ' is not painted by this check')
          const a = seg.start.map((v) => v * scale), b = seg.end.map((v) => v * scale)
          if (!last || a[0] !== last[0] || a[1] !== last[1]) { cur = [a]; contours.push(cur) }
          cur.push(b)
          last = b
        }
        for (const c of contours) {
          const f = c[0], l = c[c.length - 1]
          if (f[0] !== l[0] || f[1] !== l[1]) fail(file + ': open contour in a region')
          c.pop()
        }
        polygonRows(contours)
        break
      }
      case 'polarity':
        if (o.polarity !== 'dark') fail(file + ': polarity ' + o.polarity + ' is not painted by this check')
        break
      default:
        fail(file + ': image object ' + o.type + ' is not painted by this check')
    }
  }
  let dark = 0
  for (let k = 0; k < img.length; k++) dark += img[k]
  process.stdout.write(JSON.stringify({
    reader: 'gerber-parser 4.2.7 + gerber-plotter 4.2.8',
    units: size.units,
    boxMM: [x0, y0, x1, y1],
    pixelMM: pixelMM,
    darkPixels: dark,
    areaMM2: dark * pixelMM * pixelMM,
    objects: counts,
    warnings: warnings,
  }) + '\n')
}
