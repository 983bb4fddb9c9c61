/** Visitwort's mark: a five-petalled flower with a dark centre, drawn in the palette. */
export function Mark({ className }: { className?: string }) {
  const petals = [0, 72, 144, 216, 288];
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      {petals.map((angle) => (
        <ellipse key={angle} cx="16" cy="8.5" rx="5" ry="7" fill="#E0A526" stroke="#24231F" strokeWidth="0.8" transform={`rotate(${angle} 16 16)`} />
      ))}
      <circle cx="16" cy="16" r="4.6" fill="#3F5E3A" stroke="#24231F" strokeWidth="0.8" />
    </svg>
  );
}
