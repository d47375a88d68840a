export default function CheckMailPage() {
  return (
    <div className="mx-auto max-w-md space-y-3">
      <h1 className="text-2xl font-semibold">Check your mail</h1>
      <p>We sent you a sign-in link. It works once and for 30 minutes.</p>
    </div>
  );
}
