// The corner colour of a loaded image, so the box around a scaled-down scene continues its sky
// (a mask, drawn on black, is given black by its caller). Falls back to a mid sea grey when the
// canvas cannot be read.
export function cornerColour(el: HTMLImageElement): string {
  try {
    const c = document.createElement('canvas')
    c.width = 1
    c.height = 1
    const ctx = c.getContext('2d')!
    ctx.drawImage(el, 0, 0, 1, 1, 0, 0, 1, 1)
    const [r, g, b] = ctx.getImageData(0, 0, 1, 1).data
    return `rgb(${r} ${g} ${b})`
  }
  catch {
    return '#8aa0b0'
  }
}
