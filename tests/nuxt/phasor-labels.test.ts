// Label placement on a phasor dial: collinear phasors (a high-leg delta's c–n lies along c–a)
// must not put one label on top of the other or on another arrow when a clear spot exists.
import { describe, expect, it } from 'vitest'
import { boxesOverlap, placePhasorLabels } from '~/utils/phasorLabels'

const centre = { x: 220, y: 190 }
const tipAt = (degrees: number, r: number) => ({ x: centre.x + r * Math.cos((degrees * Math.PI) / 180), y: centre.y - r * Math.sin((degrees * Math.PI) / 180) })

describe('placePhasorLabels', () => {
  it('puts a lone label just beyond its tip, anchored away from the centre', () => {
    const [label] = placePhasorLabels(centre, [{ degrees: 0, tip: tipAt(0, 100), name: 'a–b', reading: '240.0 V ∠ 0.0°' }], 440, 372)
    expect(label!.anchor).toBe('start')
    expect(label!.x).toBeGreaterThan(320)
  })

  it('keeps the labels of collinear phasors apart and inside the drawing', () => {
    const requests = [
      { degrees: 150, tip: tipAt(150, 100), name: 'c–a', reading: '240.0 V ∠ 150.0°' },
      { degrees: 30, tip: tipAt(30, 100), name: 'a–b', reading: '240.0 V ∠ 30.0°' },
      { degrees: -90, tip: tipAt(-90, 100), name: 'b–c', reading: '240.0 V ∠ −90.0°' },
      { degrees: 150, tip: tipAt(150, 50), name: 'c–n', reading: '120.0 V ∠ 150.0°' },
      { degrees: 30, tip: tipAt(30, 50), name: 'a–n', reading: '120.0 V ∠ 30.0°' },
    ]
    const labels = placePhasorLabels(centre, requests, 440, 372)
    for (let i = 0; i < labels.length; i++) {
      const b = labels[i]!.box
      expect(b.left).toBeGreaterThanOrEqual(0)
      expect(b.right).toBeLessThanOrEqual(440)
      for (let j = i + 1; j < labels.length; j++) expect(boxesOverlap(b, labels[j]!.box), `${requests[i]!.name} / ${requests[j]!.name}`).toBe(false)
      // and off every arrow's shaft: c–n's spot beyond its tip lies on the c–a shaft
      for (const r of requests) {
        for (let k = 1; k < 24; k++) {
          const x = centre.x + ((r.tip.x - centre.x) * k) / 24
          const y = centre.y + ((r.tip.y - centre.y) * k) / 24
          expect(x > b.left + 1 && x < b.right - 1 && y > b.top + 1 && y < b.bottom - 1, `${requests[i]!.name} on ${r.name}`).toBe(false)
        }
      }
    }
  })
})
