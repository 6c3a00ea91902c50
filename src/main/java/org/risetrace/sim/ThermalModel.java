package org.risetrace.sim;

import java.util.Arrays;

/**
 * A finite-volume heat model: an nx x ny grid of board cells (5-point conduction stencil) plus lumped nodes
 * (parts) coupled to cells by contact conductances, each node losing heat to ambient through a conductance.
 *
 * <p>Time stepping is backward Euler, unconditionally stable, so the step is chosen for accuracy only and is
 * independent of the frame interval: (C/dt + G_loss + L) T' = C/dt T + P + G_loss T_amb, solved by the
 * conjugate-gradient method with a Jacobi preconditioner (the matrix is symmetric positive definite). The
 * bookkeeping of injected, stored and lost energy is exact for the discrete scheme up to the solver tolerance.
 */
public final class ThermalModel {
    final int nx, ny, cells, nodes;
    /** Heat capacity per node, J/K. */
    final double[] capacity;
    /** Loss conductance to ambient per node, W/K. */
    final double[] loss;
    /** Conductance between cell (i, j) and (i + 1, j), index j * (nx - 1) + i, W/K. */
    final double[] gx;
    /** Conductance between cell (i, j) and (i, j + 1), index j * nx + i, W/K. */
    final double[] gy;
    /** Extra couplings (part node - cell): node a, node b, conductance. */
    int[] linkA = new int[16], linkB = new int[16];
    double[] linkG = new double[16];
    int links;
    /** Current temperatures, degrees Celsius. */
    final double[] temperature;

    /** Residual reduction per solve; the temperature error is this fraction of the step's change. */
    static final double RELATIVE_TOLERANCE = 1e-6;

    private double injectedJ, lostJ;
    private int lastIterations;
    private final double[] r, z, p, ap, rhs, diag;

    public ThermalModel(int nx, int ny, int lumpedNodes) {
        this.nx = nx;
        this.ny = ny;
        this.cells = nx * ny;
        this.nodes = cells + lumpedNodes;
        capacity = new double[nodes];
        loss = new double[nodes];
        gx = new double[Math.max(0, (nx - 1) * ny)];
        gy = new double[Math.max(0, nx * (ny - 1))];
        temperature = new double[nodes];
        r = new double[nodes];
        z = new double[nodes];
        p = new double[nodes];
        ap = new double[nodes];
        rhs = new double[nodes];
        diag = new double[nodes];
    }

    public int nx() { return nx; }
    public int ny() { return ny; }
    public int nodes() { return nodes; }
    public double[] temperature() { return temperature; }
    public double[] capacity() { return capacity; }
    public double[] loss() { return loss; }
    public double[] gx() { return gx; }
    public double[] gy() { return gy; }
    public double injectedJ() { return injectedJ; }
    public double lostJ() { return lostJ; }
    public int lastIterations() { return lastIterations; }

    /** Adds a coupling conductance between two nodes. */
    public void couple(int a, int b, double conductance) {
        if (links == linkA.length) {
            linkA = Arrays.copyOf(linkA, 2 * links);
            linkB = Arrays.copyOf(linkB, 2 * links);
            linkG = Arrays.copyOf(linkG, 2 * links);
        }
        linkA[links] = a;
        linkB[links] = b;
        linkG[links] = conductance;
        links++;
    }

    /** Sets every node to one temperature. */
    public void fill(double celsius) {
        Arrays.fill(temperature, celsius);
    }

    /** Energy stored relative to a reference state, J: sum C_i (T_i - T0_i). */
    public double storedJ(double[] reference) {
        double s = 0;
        for (int i = 0; i < nodes; i++) s += capacity[i] * (temperature[i] - reference[i]);
        return s;
    }

    /**
     * One backward-Euler step of {@code dtS} seconds with node powers {@code powerW} (W, averaged over the step)
     * and ambient {@code ambientC} at the end of the step.
     */
    public void step(double dtS, double[] powerW, double ambientC) {
        double invDt = 1.0 / dtS;
        for (int i = 0; i < nodes; i++) {
            double c = capacity[i] * invDt;
            rhs[i] = c * temperature[i] + powerW[i] + loss[i] * ambientC;
        }
        solve(invDt);
        double lostW = 0, inW = 0;
        for (int i = 0; i < nodes; i++) {
            lostW += loss[i] * (temperature[i] - ambientC);
            inW += powerW[i];
        }
        lostJ += lostW * dtS;
        injectedJ += inW * dtS;
    }

    /** The steady state under {@code powerW} at ambient {@code ambientC} (no heat capacity term). */
    public void steady(double[] powerW, double ambientC) {
        for (int i = 0; i < nodes; i++) rhs[i] = powerW[i] + loss[i] * ambientC;
        solve(0.0);
    }

    /** y = (invDt C + G_loss + L) x. */
    void multiply(double invDt, double[] x, double[] y) {
        for (int i = 0; i < nodes; i++) y[i] = (capacity[i] * invDt + loss[i]) * x[i];
        for (int j = 0; j < ny; j++) {
            int row = j * nx, grow = j * (nx - 1);
            for (int i = 0; i < nx - 1; i++) {
                double g = gx[grow + i];
                double f = g * (x[row + i] - x[row + i + 1]);
                y[row + i] += f;
                y[row + i + 1] -= f;
            }
        }
        for (int j = 0; j < ny - 1; j++) {
            int row = j * nx;
            for (int i = 0; i < nx; i++) {
                double g = gy[row + i];
                double f = g * (x[row + i] - x[row + nx + i]);
                y[row + i] += f;
                y[row + nx + i] -= f;
            }
        }
        for (int k = 0; k < links; k++) {
            double f = linkG[k] * (x[linkA[k]] - x[linkB[k]]);
            y[linkA[k]] += f;
            y[linkB[k]] -= f;
        }
    }

    private void buildDiagonal(double invDt) {
        for (int i = 0; i < nodes; i++) diag[i] = capacity[i] * invDt + loss[i];
        for (int j = 0; j < ny; j++)
            for (int i = 0; i < nx - 1; i++) {
                double g = gx[j * (nx - 1) + i];
                diag[j * nx + i] += g;
                diag[j * nx + i + 1] += g;
            }
        for (int j = 0; j < ny - 1; j++)
            for (int i = 0; i < nx; i++) {
                double g = gy[j * nx + i];
                diag[j * nx + i] += g;
                diag[(j + 1) * nx + i] += g;
            }
        for (int k = 0; k < links; k++) {
            diag[linkA[k]] += linkG[k];
            diag[linkB[k]] += linkG[k];
        }
    }

    /** Preconditioned conjugate gradients (Hestenes and Stiefel), warm-started from the current temperatures. */
    private void solve(double invDt) {
        buildDiagonal(invDt);
        double[] x = temperature;
        multiply(invDt, x, ap);
        double bnorm = 0, r0 = 0;
        for (int i = 0; i < nodes; i++) {
            r[i] = rhs[i] - ap[i];
            bnorm += rhs[i] * rhs[i];
            r0 += r[i] * r[i];
        }
        // stop when the residual has fallen by RELATIVE_TOLERANCE from the warm start (the step's own change),
        // or below a floor relative to the right-hand side (no change at all)
        double tol = Math.max(RELATIVE_TOLERANCE * Math.sqrt(r0), 1e-13 * Math.sqrt(bnorm));
        double rz = 0;
        for (int i = 0; i < nodes; i++) {
            z[i] = r[i] / diag[i];
            p[i] = z[i];
            rz += r[i] * z[i];
        }
        int it = 0;
        int maxIt = 20 * (int) Math.sqrt(nodes) + 500;
        while (it < maxIt) {
            double rn = 0;
            for (int i = 0; i < nodes; i++) rn += r[i] * r[i];
            if (Math.sqrt(rn) <= tol) break;
            multiply(invDt, p, ap);
            double pap = 0;
            for (int i = 0; i < nodes; i++) pap += p[i] * ap[i];
            if (pap <= 0) break;
            double alpha = rz / pap;
            for (int i = 0; i < nodes; i++) {
                x[i] += alpha * p[i];
                r[i] -= alpha * ap[i];
            }
            double rzNew = 0;
            for (int i = 0; i < nodes; i++) {
                z[i] = r[i] / diag[i];
                rzNew += r[i] * z[i];
            }
            double beta = rzNew / rz;
            rz = rzNew;
            for (int i = 0; i < nodes; i++) p[i] = z[i] + beta * p[i];
            it++;
        }
        lastIterations = it;
    }
}
