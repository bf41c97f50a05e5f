# Build and run the ExprModel web app. Standard two-stage .NET image build.
FROM mcr.microsoft.com/dotnet/sdk:10.0 AS build
WORKDIR /src
COPY . .
RUN dotnet publish src/ExprModel.Web/ExprModel.Web.csproj -c Release -o /app

FROM mcr.microsoft.com/dotnet/aspnet:10.0
WORKDIR /app
COPY --from=build /app .
COPY --from=build /src/wwwroot ./wwwroot
# Both databases live on the volume: the catalog (a cache, rebuilt when missing) and the shared snapshots (kept).
ENV ASPNETCORE_URLS=http://0.0.0.0:8080 \
    EXPRMODEL_CATALOG_DB=/data/catalog.db \
    EXPRMODEL_APP_DB=/data/snapshots.db
VOLUME /data
EXPOSE 8080
ENTRYPOINT ["dotnet", "ExprModel.Web.dll"]
