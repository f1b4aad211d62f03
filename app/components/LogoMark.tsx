/** Gatecrash's mark: a chip tile with a bar of the beam crashing through its gate. Drawn for this product. */
export function LogoMark({ size = 28, className }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" className={className}>
      <rect x="3" y="3" width="26" height="26" rx="4" fill="#16131f" />
      <path d="M8 9h7v3H11v8h4v3H8z" fill="#faf7f2" />
      <path d="M17 9h7v14h-7v-3h4v-8h-4z" fill="#faf7f2" opacity="0.55" />
      <path d="M5 22 L27 8 L28.5 10.5 L6.5 24.5 Z" fill="#b23a0b" />
      {[8, 14, 20].map((y) => (
        <rect key={y} x="0.5" y={y} width="2.5" height="2" fill="#16131f" />
      ))}
      {[8, 14, 20].map((y) => (
        <rect key={`r${y}`} x="29" y={y} width="2.5" height="2" fill="#16131f" />
      ))}
    </svg>
  );
}
