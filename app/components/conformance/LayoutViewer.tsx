import { useRef, useState, type PointerEvent, type WheelEvent } from "react";

/** The layout picture with zoom (wheel or buttons) and pan (drag or arrow keys). */
export function LayoutViewer({ src, alt }: { src: string; alt: string }) {
  const [view, setView] = useState({ scale: 1, x: 0, y: 0 });
  const drag = useRef<{ x: number; y: number } | null>(null);
  const zoom = (factor: number) => setView((v) => ({ ...v, scale: Math.min(40, Math.max(1, v.scale * factor)) }));
  const onWheel = (e: WheelEvent) => zoom(e.deltaY < 0 ? 1.2 : 1 / 1.2);
  const onDown = (e: PointerEvent) => {
    drag.current = { x: e.clientX - view.x, y: e.clientY - view.y };
    (e.target as Element).setPointerCapture?.(e.pointerId);
  };
  const onMove = (e: PointerEvent) => {
    if (drag.current) setView((v) => ({ ...v, x: e.clientX - drag.current!.x, y: e.clientY - drag.current!.y }));
  };
  return (
    <div>
      <div className="mb-2 flex gap-2">
        <button type="button" className="btn-quiet" onClick={() => zoom(1.5)} aria-label="Zoom in">
          +
        </button>
        <button type="button" className="btn-quiet" onClick={() => zoom(1 / 1.5)} aria-label="Zoom out">
          −
        </button>
        <button type="button" className="btn-quiet" onClick={() => setView({ scale: 1, x: 0, y: 0 })}>
          Fit
        </button>
      </div>
      <div
        className="relative h-80 cursor-grab overflow-hidden rounded-lg border border-line bg-paper"
        tabIndex={0}
        role="group"
        aria-label={`${alt} — drag or use arrow keys to pan, + and − to zoom`}
        onWheel={onWheel}
        onPointerDown={onDown}
        onPointerMove={onMove}
        onPointerUp={() => (drag.current = null)}
        onKeyDown={(e) => {
          const step = 40;
          if (e.key === "+" || e.key === "=") zoom(1.5);
          else if (e.key === "-") zoom(1 / 1.5);
          else if (e.key === "ArrowLeft") setView((v) => ({ ...v, x: v.x + step }));
          else if (e.key === "ArrowRight") setView((v) => ({ ...v, x: v.x - step }));
          else if (e.key === "ArrowUp") setView((v) => ({ ...v, y: v.y + step }));
          else if (e.key === "ArrowDown") setView((v) => ({ ...v, y: v.y - step }));
          else return;
          e.preventDefault();
        }}
      >
        <img
          src={src}
          alt={alt}
          draggable={false}
          className="h-full w-full select-none object-contain"
          style={{ transform: `translate(${view.x}px, ${view.y}px) scale(${view.scale})`, transformOrigin: "center" }}
        />
      </div>
    </div>
  );
}
