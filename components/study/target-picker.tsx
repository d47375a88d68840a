'use client';

import { inputClass } from '@/components/forms/field';
import { SPEED_OF_LIGHT_KMS } from '@/lib/engine/lines';
import { GALAXY_PRESETS } from '@/lib/engine/target';

/**
 * Picks a target galaxy or a typed redshift z and writes the equivalent radial
 * velocity v = c·z into the study (the engine moves lines by λ·(1 + v/c), which
 * is exactly λ₀·(1 + z)). Redshifts: NED, from memory.
 */
export function TargetPicker({ velocity, onVelocity }: { velocity: string; onVelocity: (v: string) => void }) {
  const v = Number(velocity || '0');
  const z = Number.isFinite(v) ? v / SPEED_OF_LIGHT_KMS : NaN;
  const match = GALAXY_PRESETS.find((g) => Math.abs(g.z * SPEED_OF_LIGHT_KMS - v) < 0.05);
  const toV = (zz: number) => String(Math.round(zz * SPEED_OF_LIGHT_KMS * 10) / 10);
  return (
    <div className="grid grid-cols-[minmax(0,1fr)_7rem] gap-2" data-testid="target-picker">
      <div>
        <label htmlFor="study-target" className="mb-1 block text-sm">
          Target
        </label>
        <select id="study-target" className={inputClass} value={match?.id ?? (v === 0 ? '' : 'typed')} onChange={(e) => {
          const g = GALAXY_PRESETS.find((x) => x.id === e.target.value);
          onVelocity(g ? toV(g.z) : '');
        }}>
          <option value="">In our galaxy (z = 0)</option>
          {GALAXY_PRESETS.map((g) => (
            <option key={g.id} value={g.id}>
              {g.name}, z = {g.z.toFixed(6)}
            </option>
          ))}
          {match || v === 0 ? null : <option value="typed">Typed velocity or z</option>}
        </select>
      </div>
      <div>
        <label htmlFor="study-z" className="mb-1 block text-sm">
          Redshift z
        </label>
        <input
          id="study-z"
          className={inputClass}
          inputMode="decimal"
          key={velocity}
          defaultValue={Number.isFinite(z) && z !== 0 ? String(Number(z.toFixed(6))) : ''}
          placeholder="0"
          onBlur={(e) => {
            const typed = Number(e.target.value || '0');
            if (Number.isFinite(typed) && typed >= -0.1 && typed <= 0.1) onVelocity(typed === 0 ? '' : toV(typed));
          }}
        />
      </div>
      <p className="col-span-2 text-xs text-muted">Galaxy redshifts from the NASA/IPAC Extragalactic Database (NED), as recalled; z sets the velocity below as v = c·z.</p>
    </div>
  );
}
