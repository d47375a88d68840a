export default function CheckMailPage() {
  return (
    <div className="mx-auto max-w-md space-y-3">
      <h1 className="text-2xl font-semibold">Check your mail</h1>
      <p>We sent a message to that address. If it belongs to an account, it holds a sign-in link that works once and for 30 minutes.</p>
    </div>
  );
}
