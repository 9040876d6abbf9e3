'use client';

/**
 * Download buttons for the design diagram drawn by `DesignDiagram`: "Download SVG" saves the SVG
 * element (found by id) as a standalone file with its namespaces, a fixed size, system fonts and
 * a white background; "Download PNG" draws that SVG through an Image onto a canvas at 2×.
 * Nothing leaves the browser.
 */
import { useState } from 'react';
import { Button } from '@/components/ui/button';

export interface DiagramExportProps {
  /** Id of the diagram's <svg> element. */
  svgId: string;
  /** File name without extension (".svg" / ".png" are added). */
  fileName: string;
}

const SVG_NS = 'http://www.w3.org/2000/svg';
const FONT_STACK = 'system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, "DejaVu Sans", sans-serif';

function safeName(name: string): string {
  return name.trim().replace(/\.(svg|png)$/i, '').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'design-diagram';
}

function standaloneSvg(svgId: string): { markup: string; width: number; height: number } | undefined {
  const el = document.getElementById(svgId);
  if (!el || !(el instanceof SVGSVGElement)) return undefined;
  const vb = el.viewBox.baseVal;
  const rect = el.getBoundingClientRect();
  const width = vb && vb.width ? vb.width : rect.width;
  const height = vb && vb.height ? vb.height : rect.height;
  const clone = el.cloneNode(true) as SVGSVGElement;
  clone.setAttribute('xmlns', SVG_NS);
  clone.setAttribute('xmlns:xlink', 'http://www.w3.org/1999/xlink');
  clone.setAttribute('width', String(width));
  clone.setAttribute('height', String(height));
  clone.setAttribute('style', `font-family: ${FONT_STACK}; background: #ffffff`);
  // White background as the first drawn element.
  const bg = document.createElementNS(SVG_NS, 'rect');
  bg.setAttribute('x', '0');
  bg.setAttribute('y', '0');
  bg.setAttribute('width', String(width));
  bg.setAttribute('height', String(height));
  bg.setAttribute('fill', '#ffffff');
  const firstDrawn = Array.from(clone.children).find((c) => !['title', 'desc', 'defs'].includes(c.tagName.toLowerCase()));
  clone.insertBefore(bg, firstDrawn ?? null);
  const markup = '<?xml version="1.0" encoding="UTF-8"?>\n' + new XMLSerializer().serializeToString(clone);
  return { markup, width, height };
}

function save(blob: Blob, name: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export function DiagramExport({ svgId, fileName }: DiagramExportProps) {
  const [error, setError] = useState<string | null>(null);
  const base = safeName(fileName);
  const failed = 'The PNG could not be made in this browser; the SVG download still works.';

  function downloadSvg() {
    setError(null);
    const svg = standaloneSvg(svgId);
    if (!svg) return setError('The diagram is not on the page yet.');
    save(new Blob([svg.markup], { type: 'image/svg+xml;charset=utf-8' }), `${base}.svg`);
  }

  function downloadPng() {
    setError(null);
    const svg = standaloneSvg(svgId);
    if (!svg) return setError('The diagram is not on the page yet.');
    const scale = 2;
    const url = URL.createObjectURL(new Blob([svg.markup], { type: 'image/svg+xml;charset=utf-8' }));
    const img = new Image();
    img.onload = () => {
      try {
        const canvas = document.createElement('canvas');
        canvas.width = Math.round(svg.width * scale);
        canvas.height = Math.round(svg.height * scale);
        const ctx = canvas.getContext('2d');
        if (!ctx) throw new Error('No 2D canvas.');
        ctx.fillStyle = '#ffffff';
        ctx.fillRect(0, 0, canvas.width, canvas.height);
        ctx.drawImage(img, 0, 0, canvas.width, canvas.height);
        canvas.toBlob((blob) => (blob ? save(blob, `${base}.png`) : setError(failed)), 'image/png');
      } catch {
        setError(failed);
      } finally {
        URL.revokeObjectURL(url);
      }
    };
    img.onerror = () => {
      URL.revokeObjectURL(url);
      setError(failed);
    };
    img.src = url;
  }

  return (
    <div className="flex flex-wrap items-center gap-2">
      <Button variant="secondary" onClick={downloadSvg}>
        Download SVG
      </Button>
      <Button variant="secondary" onClick={downloadPng}>
        Download PNG
      </Button>
      {error && (
        <p role="alert" className="text-sm text-danger">
          {error}
        </p>
      )}
    </div>
  );
}

export default DiagramExport;
