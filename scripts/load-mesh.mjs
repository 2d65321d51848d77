// A large, valid circuit document for load tests (node built-ins only).
/**
 * A mesh of `loads` loads among `nodes` nodes fed by a 480 V delta supply: the kind of
 * document that keeps the engine busy (the load benchmark's abuse case and the pool's tests).
 * Deterministic: the same document every time.
 */
export function loadMesh(nodes, loads) {
  const components = [{ id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 }]
  const wires = []
  const first = []
  let seed = 7
  const next = () => {
    seed = (seed * 1103515245 + 12345) % 2147483648
    return seed / 2147483648
  }
  for (let j = 0; j < loads; j++) {
    const u = j < nodes ? j : Math.floor(next() * nodes)
    let v = j < nodes ? (j + 1) % nodes : Math.floor(next() * nodes)
    if (v === u) v = (u + 1) % nodes
    components.push({ id: `L${j}`, kind: 'load', ohms: 10 + (j % 7) })
    for (const [end, node] of [['a', u], ['b', v]]) {
      const terminal = `L${j}.${end}`
      if (first[node] === undefined) first[node] = terminal
      else wires.push([first[node], terminal])
    }
  }
  wires.push(['S1.A', first[0]], ['S1.B', first[Math.floor(nodes / 3)]], ['S1.C', first[Math.floor((2 * nodes) / 3)]])
  return { format: 'phaseloom.circuit', version: 1, name: 'load mesh', components, wires }
}
