// The look of the memory pictures (crew and person): the dim red night theme keeps dark
// adaptation, so lines and text take its reds; one options builder for their line charts.
import type { ChartOptions } from 'chart.js'

export function useFitChartStyle() {
  const night = useNightMode()
  const ink = computed(() => (night.value ? '#d23c3c' : '#3b5466'))
  const grid = computed(() => (night.value ? '#3a0a0a' : 'rgba(15, 42, 61, 0.1)'))
  // The reference line (defaults, or what the crew's parameters predict) and what is measured against it.
  const reference = computed(() => (night.value ? '#7a1f1f' : '#3b5466'))
  const measured = computed(() => (night.value ? '#d23c3c' : '#c25e00'))
  const diagonal = computed(() => (night.value ? '#5a1414' : 'rgba(15, 42, 61, 0.45)'))
  const axis = (text: string, max?: number) => ({
    type: 'linear' as const, min: 0, max, title: { display: true, text, color: ink.value }, ticks: { color: ink.value }, grid: { color: grid.value },
  })
  const lineOptions = (x: { title: string, max?: number }, y: { title: string, max?: number }) => computed<ChartOptions<'line'>>(() => ({
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    parsing: false,
    scales: { x: axis(x.title, x.max), y: axis(y.title, y.max) },
    plugins: { legend: { position: 'bottom', labels: { color: ink.value } } },
  }))
  return { reference, measured, diagonal, lineOptions }
}
