/** The top-level sections of the app, in navigation order. */
export interface Section {
  to: string
  label: string
  summary: string
}

export const sections: readonly Section[] = [
  { to: '/bench', label: 'Bench', summary: 'Wire a bank from single-phase units, predict, energize and probe it.' },
  { to: '/starters', label: 'Starters', summary: 'Ready-made banks to open on the Bench and learn from.' },
  { to: '/hunts', label: 'Hunts', summary: 'Fault hunts: banks with a hidden fault to find before closing the delta.' },
  { to: '/classes', label: 'Classes', summary: 'Instructors gather students, send invitations and follow attempts.' },
  { to: '/lab-sheets', label: 'Lab sheets', summary: 'Real readings from the lab set against what the bank predicts.' },
  { to: '/site-check', label: 'Site check', summary: 'Plan a bank for site work and print a pre-energization sheet.' },
]
