// The Foldfolio mark: a manuscript leaf with its corner folded over, crossed by a chain trace
// that turns into a helix — a paper about a fold. Drawn here so it ships with the bundle.
export function FoldfolioMark({ size = 28 }: { size?: number }) {
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 32 32"
      role="img"
      aria-label="Foldfolio mark"
      className="ff-mark"
    >
      <path d="M6 3h14l6 6v20H6z" fill="var(--ff-paper)" stroke="var(--ff-ink)" strokeWidth="1.6" />
      <path d="M20 3v6h6" fill="var(--ff-sage-soft)" stroke="var(--ff-ink)" strokeWidth="1.6" />
      <path
        d="M9 24c2-6 4-6 5-3s3 3 4-2 2-6 4-4"
        fill="none"
        stroke="var(--ff-primary)"
        strokeWidth="2"
        strokeLinecap="round"
      />
      <circle cx="9" cy="24" r="1.4" fill="var(--ff-primary)" />
    </svg>
  );
}

export function Wordmark({ size = 28 }: { size?: number }) {
  return (
    <span className="ff-wordmark">
      <FoldfolioMark size={size} />
      <span className="ff-wordmark-text">Foldfolio</span>
    </span>
  );
}
