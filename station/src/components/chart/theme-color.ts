/**
 * A theme colour (`steel`, `over`…) as the canvas takes it. The theme's colours are CSS
 * `light-dark()` values, which a canvas cannot read: the browser resolves one on an element.
 */
export function themeColor(name: string, alpha = 1): string {
  const probe = document.createElement('span');
  probe.style.color = `var(--color-${name})`;
  probe.style.display = 'none';
  document.body.append(probe);
  const rgb = getComputedStyle(probe).color;
  probe.remove();
  const m = /rgba?\((\d+),\s*(\d+),\s*(\d+)/.exec(rgb);
  return m ? `rgba(${m[1]}, ${m[2]}, ${m[3]}, ${alpha})` : rgb || 'gray';
}
