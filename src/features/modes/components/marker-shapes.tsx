/**
 * The marker shapes of the Modes charts, once for the canvas and once as SVG for the keys beside
 * them, so a key always looks like what the chart draws.
 */
export type Shape = "diamond" | "square" | "circle" | "triangle" | "ring";

/** Draws `shape` centred on (x, y) with half-size r (canvas px). */
export function drawShape(ctx: CanvasRenderingContext2D, shape: Shape, x: number, y: number, r: number, colour: string, paper: string) {
  ctx.beginPath();
  if (shape === "diamond") {
    ctx.moveTo(x, y - r);
    ctx.lineTo(x + r, y);
    ctx.lineTo(x, y + r);
    ctx.lineTo(x - r, y);
    ctx.closePath();
  } else if (shape === "square") ctx.rect(x - r * 0.8, y - r * 0.8, r * 1.6, r * 1.6);
  else if (shape === "triangle") {
    ctx.moveTo(x, y - r);
    ctx.lineTo(x + r, y + r * 0.8);
    ctx.lineTo(x - r, y + r * 0.8);
    ctx.closePath();
  } else ctx.arc(x, y, r * 0.85, 0, 2 * Math.PI);
  const hollow = shape === "diamond" || shape === "square" || shape === "ring";
  ctx.fillStyle = hollow ? paper : colour;
  ctx.fill();
  ctx.strokeStyle = colour;
  ctx.stroke();
}

export function ShapeIcon({ shape, colour }: { shape: Shape; colour: string }) {
  const hollow = shape === "diamond" || shape === "square" || shape === "ring";
  const common = { fill: hollow ? "#fffdf9" : colour, stroke: colour, strokeWidth: 1.6 };
  return (
    <svg width="14" height="14" viewBox="-7 -7 14 14" aria-hidden="true" className="inline-block align-[-2px]">
      {shape === "diamond" ? <path d="M0,-5.5L5.5,0L0,5.5L-5.5,0Z" {...common} /> : null}
      {shape === "square" ? <rect x={-4.4} y={-4.4} width={8.8} height={8.8} {...common} /> : null}
      {shape === "triangle" ? <path d="M0,-5.5L5.5,4.4L-5.5,4.4Z" {...common} /> : null}
      {shape === "circle" || shape === "ring" ? <circle r={4.7} {...common} /> : null}
    </svg>
  );
}

export function KeyItem({ shape, colour, children }: { shape: Shape; colour: string; children: React.ReactNode }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap">
      <ShapeIcon shape={shape} colour={colour} />
      {children}
    </span>
  );
}
