// Saving a chart: as SVG text, or as PNG by drawing the SVG onto a canvas.

import { download } from './dom.js';

// svgText serialises a chart's SVG as a standalone file.
export function svgText(node) {
  const copy = node.cloneNode(true);
  copy.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
  copy.removeAttribute('class');
  for (const n of copy.querySelectorAll('[tabindex]')) n.removeAttribute('tabindex');
  for (const n of copy.querySelectorAll('[data-tip]')) n.removeAttribute('data-tip');
  return '<?xml version="1.0" encoding="UTF-8"?>\n' + new XMLSerializer().serializeToString(copy);
}

export function saveSVG(node, name) {
  download(new Blob([svgText(node)], { type: 'image/svg+xml' }), name + '.svg');
}

// pngBlob draws the SVG at twice its size onto a canvas and returns a PNG.
export function pngBlob(node, scale = 2) {
  const w = Number(node.getAttribute('width')) || node.viewBox.baseVal.width;
  const h = Number(node.getAttribute('height')) || node.viewBox.baseVal.height;
  const url = URL.createObjectURL(new Blob([svgText(node)], { type: 'image/svg+xml' }));
  return new Promise((resolve, reject) => {
    const img = new Image();
    img.onload = () => {
      const canvas = document.createElement('canvas');
      canvas.width = Math.round(w * scale);
      canvas.height = Math.round(h * scale);
      const ctx = canvas.getContext('2d');
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(0, 0, canvas.width, canvas.height);
      ctx.drawImage(img, 0, 0, canvas.width, canvas.height);
      URL.revokeObjectURL(url);
      canvas.toBlob((b) => (b ? resolve(b) : reject(new Error('the browser could not make a PNG'))), 'image/png');
    };
    img.onerror = () => {
      URL.revokeObjectURL(url);
      reject(new Error('the browser could not draw the chart as an image'));
    };
    img.src = url;
  });
}

export async function savePNG(node, name) {
  download(await pngBlob(node), name + '.png');
}
