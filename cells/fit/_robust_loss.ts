/**
 * The losses of a robust fit (`loss:`): ρ, its derivative ψ = ρ′, ψ′ and the
 * IRLS weight ψ(u)/u of a residual u = √wᵢ·rᵢ/s already divided by the
 * robust scale s, each with its tuning constant c.
 *
 * ```
 *  loss       ρ(u)                                 weight ψ(u)/u           c (95% at the normal)
 *  huber      u²/2 (|u| ≤ c); c|u| − c²/2          min(1, c/|u|)           1.345
 *  soft_l1    c²(√(1 + (u/c)²) − 1)                1/√(1 + (u/c)²)         1.287
 *  bisquare   c²/6·(1 − (1 − (u/c)²)³) (|u| ≤ c)   (1 − (u/c)²)² (|u| ≤ c) 4.685
 * ```
 *
 * Sources: Huber (1964, Ann. Math. Statist. 35:73–101; *Robust Statistics*,
 * 1981, §4.5 and §7.6) for the Huber loss; Beaton & Tukey (1974,
 * Technometrics 16:147–185) for the bisquare; soft-L1 is the smooth
 * ρ(z) = 2(√(1 + z²) − 1) of z = u/c, scaled by c²/2 so that every loss is
 * u²/2 near 0 (the same minimiser; ψ′(0) = 1). Tuning constants: 1.345 and
 * 4.685 give 95% asymptotic efficiency at the normal (Holland & Welsch 1977,
 * Commun. Statist. A6:813–827, Table 1; from memory); 1.287 does the same for
 * soft-L1 (computed here: (Eψ′)²/Eψ² at N(0, 1) by quadrature, checked in
 * robust_test.ts).
 *
 * @module
 */

/** The robust losses a fit offers. */
export const LOSSES = ["huber", "soft_l1", "bisquare"] as const;
export type Loss = typeof LOSSES[number];

/** Tuning constants giving 95% asymptotic efficiency at the normal (see the module notes). */
export const DEFAULT_TUNING: Readonly<Record<Loss, number>> = {
  huber: 1.345,
  soft_l1: 1.287,
  bisquare: 4.685,
};

/** A loss with its tuning constant: ρ, ψ, ψ′ and the IRLS weight of a scaled residual. */
export interface LossFunctions {
  rho(u: number): number;
  psi(u: number): number;
  /** dψ/du (0 at Huber's corners, where it jumps: the side of |u| ≤ c is taken). */
  dpsi(u: number): number;
  /** ψ(u)/u, 1 at u = 0. */
  weight(u: number): number;
}

/**
 * The functions of a loss.
 *
 * @param loss The loss.
 * @param c Its tuning constant (> 0).
 * @returns ρ, ψ, ψ′ and the weight.
 * @example
 * ```ts
 * import { lossFunctions } from "./_robust_loss.ts";
 * const h = lossFunctions("huber", 1.345);
 * if (h.weight(2.69) !== 0.5 || h.psi(-3) !== -1.345) throw new Error("Huber: c/|u|, clipped ψ");
 * ```
 */
export function lossFunctions(loss: Loss, c: number): LossFunctions {
  switch (loss) {
    case "huber":
      return {
        rho: (u) => Math.abs(u) <= c ? u * u / 2 : c * Math.abs(u) - c * c / 2,
        psi: (u) => Math.max(-c, Math.min(c, u)),
        dpsi: (u) => Math.abs(u) <= c ? 1 : 0,
        weight: (u) => Math.abs(u) <= c ? 1 : c / Math.abs(u),
      };
    case "soft_l1":
      return {
        rho: (u) => c * c * (Math.sqrt(1 + (u / c) ** 2) - 1),
        psi: (u) => u / Math.sqrt(1 + (u / c) ** 2),
        dpsi: (u) => (1 + (u / c) ** 2) ** -1.5,
        weight: (u) => 1 / Math.sqrt(1 + (u / c) ** 2),
      };
    case "bisquare":
      return {
        rho: (u) => Math.abs(u) <= c ? c * c / 6 * (1 - (1 - (u / c) ** 2) ** 3) : c * c / 6,
        psi: (u) => Math.abs(u) <= c ? u * (1 - (u / c) ** 2) ** 2 : 0,
        dpsi: (u) => {
          const z = (u / c) ** 2;
          return Math.abs(u) <= c ? (1 - z) * (1 - 5 * z) : 0;
        },
        weight: (u) => Math.abs(u) <= c ? (1 - (u / c) ** 2) ** 2 : 0,
      };
  }
}

/** The loss in words, for the page and the CLI summary. */
export const LOSS_WORDS: Readonly<Record<Loss, string>> = {
  huber: "Huber",
  soft_l1: "soft-L1",
  bisquare: "Tukey's bisquare",
};
