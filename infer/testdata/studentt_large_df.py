# Reference values for TestStudentTLargeDFAgainstReference
# (infer/tlarge_test.go): rows {df, two-sided p, t} with p = 2 P(T_df > t),
# from mpmath 1.3.0 at 80 digits. p is the density integrated from t to
# infinity (mpmath.quad, tanh-sinh, relative to the density at t), which
# agrees with the regularized incomplete beta betainc(df/2, 1/2, 0,
# df/(df + t^2)) to 1e-49 or better where that is quick to compute
# (checked below for p >= 1e-20) and, in the far tail, gives back the
# 20-digit t of the 60-digit beta reference at df 1e4 and 1e5 (checked
# below). t is the root of p in log t by mpmath.findroot from near the
# normal quantile, kept only if p(t) agrees with the target to 1e-60
# relative; it is printed to 20 digits.
# Run: python3 studentt_large_df.py
from mpmath import mp, mpf, quad, betainc, loggamma, log, exp, pi, inf, findroot, sqrt, erfinv, nstr

mp.dps = 80


def two_sided_p(t, df):
    # The density relative to its value at t, so that quad's error, which
    # is absolute, is relative to p however small p is.
    logc = loggamma((df + 1) / 2) - loggamma(df / 2) - log(df * pi) / 2
    logf = lambda s: logc - (df + 1) / 2 * log(1 + s * s / df)
    ratio = lambda s: exp(logf(s) - logf(t))
    return 2 * exp(logf(t)) * quad(ratio, [t, t + 1, t + 10, inf])


# The integral against the incomplete beta in the far tail, at the rows of
# studentTReference (distributions_test.go) whose t were found from it.
for df, p, t in [(10000, "1e-300", "38.377096008267731109"), (100000, "1e-100", "21.33019558815742386"),
                 (100000, "1e-300", "37.193555717179355023")]:
    assert abs(two_sided_p(mpf(t), mpf(df)) / mpf(p) - 1) < mpf("1e-16"), (df, p)

for df in ["1e6", "1e8", "1e10", "1e12", "1e15"]:
    nu = mpf(df)
    for p in ["0.5", "0.05", "1e-3", "1e-8", "1e-20", "1e-100", "1e-300"]:
        target = mpf(p)
        # A start near the root: the normal quantile, or where 1 - p
        # rounds to 1, the leading term of its tail, sqrt(-2 log p).
        z = sqrt(2) * erfinv(1 - target) if target > mpf("1e-60") else sqrt(-2 * log(target))
        u = findroot(lambda u: log(two_sided_p(exp(u), nu)) - log(target), log(z))
        t = exp(u)
        assert abs(two_sided_p(t, nu) / target - 1) < mpf("1e-60"), (df, p)
        if target >= mpf("1e-20"):
            beta = betainc(nu / 2, mpf(1) / 2, 0, nu / (nu + t * t), regularized=True)
            assert abs(beta / target - 1) < mpf("1e-49"), (df, p, beta)
        print("\t{%s, %s, %s}," % (df, p, nstr(t, 20, min_fixed=-inf, max_fixed=inf)))
