// Placeholder until its page is built (issue #7).
export default function Placeholder() {
  return <p>This page is being built.</p>
}
